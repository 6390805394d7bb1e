import { lineAt, offsetAfterBreaks, type TextBatch } from './text.js';

/**
 * The recent text of one input, from the start of the statement being read, so that a reader can
 * report the text of a line and start over at any line after a syntax error. Memory stays bounded by
 * the longest statement, not the file.
 */
export class RetainedText {
  private batches: TextBatch[] = [];
  private chars = 0;

  /** @param limit characters kept at most, newest first, even when a statement is longer (one huge Turtle statement). */
  constructor(private readonly limit = 64 * 1024 * 1024) {}

  push(batch: TextBatch): void {
    this.batches.push(batch);
    this.chars += batch.text.length;
  }

  /** Forgets batches that end before line `line`, and the oldest beyond the limit (always keeps the newest). */
  dropBefore(line: number): void {
    let drop = 0;
    let chars = this.chars;
    while (drop < this.batches.length - 1 && (end(this.batches[drop]!) <= line || chars > this.limit)) {
      chars -= this.batches[drop]!.text.length;
      drop++;
    }
    if (drop > 0) {
      this.batches = this.batches.slice(drop);
      this.chars = chars;
    }
  }

  /** The retained text from the start of line `line` on, as pieces. */
  *from(line: number): Generator<string> {
    for (const batch of this.batches) {
      if (end(batch) < line) continue;
      if (batch.firstLine >= line) yield batch.text;
      else yield batch.text.slice(offsetAfterBreaks(batch.text, line - batch.firstLine));
    }
  }

  /** The content of line `line` without its line break; empty when it is not retained. */
  line(line: number): string {
    for (const batch of this.batches) {
      if (line < batch.firstLine || line > end(batch)) continue;
      const start = offsetAfterBreaks(batch.text, line - batch.firstLine);
      if (start < batch.text.length) return lineAt(batch.text, start);
    }
    return '';
  }

  /** The first line at or after `from` whose content satisfies `test`; -1 when none is retained. */
  find(from: number, test: (content: string) => boolean): number {
    for (const batch of this.batches) {
      if (end(batch) < from) continue;
      let line = Math.max(from, batch.firstLine);
      let pos = offsetAfterBreaks(batch.text, line - batch.firstLine);
      while (pos < batch.text.length) {
        if (test(lineAt(batch.text, pos))) return line;
        pos = offsetAfterBreaks(batch.text, 1, pos);
        line++;
      }
    }
    return -1;
  }
}

/** The number of the line that follows the batch's text. */
function end(batch: TextBatch): number {
  return batch.firstLine + batch.breaks;
}

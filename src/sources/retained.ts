import { lineStarts, type TextBatch } from './text.js';

/**
 * The recent text of one input, from the start of the statement being read, so that a reader can
 * report the text of a line and start over at any line after a syntax error. Memory stays bounded by
 * the longest statement, not the file.
 */
export class RetainedText {
  private batches: TextBatch[] = [];
  private chars = 0;
  private readonly lineIndex = new WeakMap<TextBatch, Int32Array>();

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
      else yield batch.text.slice(this.start(batch, line));
    }
  }

  /** The content of line `line` without its line break; empty when it is not retained. */
  line(line: number): string {
    for (const batch of this.batches) {
      if (line < batch.firstLine || line > end(batch)) continue;
      const starts = this.starts(batch);
      const k = line - batch.firstLine;
      if (k >= starts.length) continue;
      return contentOf(batch.text, starts[k]!, k + 1 < starts.length ? starts[k + 1]! : batch.text.length);
    }
    return '';
  }

  /** The first line at or after `from` whose content satisfies `test`; -1 when none is retained. */
  find(from: number, test: (content: string) => boolean): number {
    for (const batch of this.batches) {
      if (end(batch) < from) continue;
      const starts = this.starts(batch);
      for (let k = Math.max(0, from - batch.firstLine); k < starts.length; k++) {
        const content = contentOf(
          batch.text,
          starts[k]!,
          k + 1 < starts.length ? starts[k + 1]! : batch.text.length,
        );
        if (test(content)) return batch.firstLine + k;
      }
    }
    return -1;
  }

  private start(batch: TextBatch, line: number): number {
    const starts = this.starts(batch);
    const k = line - batch.firstLine;
    return k < starts.length ? starts[k]! : batch.text.length;
  }

  /** Where each line of a batch starts, computed once per batch and only when a reader looks back. */
  private starts(batch: TextBatch): Int32Array {
    let starts = this.lineIndex.get(batch);
    if (starts === undefined) {
      starts = lineStarts(batch.text);
      this.lineIndex.set(batch, starts);
    }
    return starts;
  }
}

/** A line's text between its start and the next line's start, without the line break. */
function contentOf(text: string, from: number, to: number): string {
  let end = to;
  if (end > from && text.charCodeAt(end - 1) === 10) end--;
  if (end > from && text.charCodeAt(end - 1) === 13) end--;
  return text.slice(from, end);
}

/** The number of the line that follows the batch's text. */
function end(batch: TextBatch): number {
  return batch.firstLine + batch.breaks;
}

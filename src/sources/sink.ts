import { PlumbError } from '../errors.js';
import type { GraphBuilder } from '../graph/store.js';
import { clip } from './text.js';

/**
 * Rejection records kept at most, across the files of one read; beyond it they are still counted. A
 * file that is broken on every line should not take memory in proportion to its size.
 */
export const MAX_REJECTIONS = 100_000;

/** A statement that could not be read, where it was and why. */
export interface Rejection {
  file: string;
  /** 1-based. */
  line: number;
  /** 1-based, in UTF-16 code units of the decoded line. */
  column: number;
  reason: string;
  /** The offending line, at most 200 characters. */
  text: string;
}

/**
 * Where the readers of one file deliver statements. Every statement ends in exactly one of the three
 * counters, so `statements = accepted + duplicates + rejected` holds by construction.
 */
export class FileSink {
  readonly fileIndex: number;
  accepted = 0;
  duplicates = 0;
  rejected = 0;

  constructor(
    readonly builder: GraphBuilder,
    readonly file: string,
    private readonly strict: boolean,
    private readonly rejections: Rejection[],
  ) {
    this.fileIndex = builder.addFile(file);
  }

  get statements(): number {
    return this.accepted + this.duplicates + this.rejected;
  }

  /** Adds a triple of term ids; `g` is -1 for the default graph. */
  add(s: number, p: number, o: number, g: number, line: number): void {
    if (this.builder.add(s, p, o, g, this.fileIndex, line)) this.accepted++;
    else this.duplicates++;
  }

  /** Records a malformed statement, or stops the read under `--strict`. */
  reject(line: number, column: number, reason: string, text: string): void {
    if (this.strict) {
      throw new PlumbError('E_PARSE', reason, {
        position: { file: this.file, line, column },
        hint: 'fix the statement, or run without --strict to skip malformed statements and list them',
      });
    }
    this.rejected++;
    if (this.rejections.length < MAX_REJECTIONS)
      this.rejections.push({ file: this.file, line, column, reason, text: clip(text) });
  }
}

import { PlumbError } from '../errors.js';

/**
 * Bytes to text, in batches of whole lines, so that every reader downstream knows the line number of
 * every character and can start over at any line.
 *
 * - UTF-8 only. A byte sequence that is not UTF-8 makes its line a *problem*: the line is blanked
 *   (its line break kept, so numbering holds) and reported once; `--strict` stops there instead.
 * - A byte order mark at the start of the input is dropped.
 * - Line breaks are LF, CRLF or a lone CR, counted as the RDF grammars and `n3` count them.
 * - A line longer than `maxLineLength` characters is a problem too, so a file without line breaks
 *   (binary data, a dump on one line) cannot make memory grow without bound.
 * - Input that starts with a NUL byte or with many invalid sequences is not text at all: that is an
 *   error in every mode, not a list of thousands of problems.
 */
export interface TextBatch {
  /** Whole lines, each with its line break; only the last batch of an input may end without one. */
  text: string;
  /** Number of the first line in `text` (1-based). */
  firstLine: number;
  /** Line breaks in `text`. */
  breaks: number;
  /** Lines the text layer has already rejected, blanked in `text`. */
  problems: LineProblem[];
}

export interface LineProblem {
  line: number;
  column: number;
  reason: string;
  /** The line as far as it could be decoded, at most 200 characters. */
  text: string;
}

export interface TextOptions {
  file: string;
  strict: boolean;
  /** Longest line accepted, in UTF-16 code units (default 64 Mi). */
  maxLineLength?: number;
}

export const MAX_LINE_LENGTH = 64 * 1024 * 1024;
const SNIFF_BYTES = 8192;
const SNIFF_MAX_INVALID = 8;

/** Counts line breaks as `n3` does: CRLF is one break, a lone CR or LF is one. */
export function countBreaks(text: string): number {
  let n = 0;
  for (let i = text.indexOf('\n'); i !== -1; i = text.indexOf('\n', i + 1)) n++;
  if (text.indexOf('\r') === -1) return n;
  for (let i = text.indexOf('\r'); i !== -1; i = text.indexOf('\r', i + 1)) {
    if (text.charCodeAt(i + 1) !== 10) n++;
  }
  return n;
}

/** The offset where each line of `text` starts (the first is 0); a text ending in a break has no empty last line. */
export function lineStarts(text: string): Int32Array {
  const starts: number[] = [0];
  const n = text.length;
  for (let i = 0; i < n; i++) {
    const c = text.charCodeAt(i);
    if (c === 10 || (c === 13 && text.charCodeAt(i + 1) !== 10)) {
      if (i + 1 < n) starts.push(i + 1);
    }
  }
  return Int32Array.from(starts);
}

/** The line of `text` that starts at `start`, without its line break. */
export function lineAt(text: string, start: number): string {
  let end = start;
  while (end < text.length) {
    const c = text.charCodeAt(end);
    if (c === 10 || c === 13) break;
    end++;
  }
  return text.slice(start, end);
}

export function clip(text: string, max = 200): string {
  return text.length <= max ? text : `${text.slice(0, max - 1)}…`;
}

/** Position of the last line break in `text` that is certainly complete (a CR at the very end may be half a CRLF). */
function lastBreak(text: string): number {
  const lf = text.lastIndexOf('\n');
  // Only a CR after the last LF matters; searching the tail keeps LF-only input from a full backward scan.
  let cr = -1;
  for (let i = text.indexOf('\r', lf + 1); i !== -1; i = text.indexOf('\r', i + 1)) cr = i;
  if (cr === text.length - 1) {
    // A CR at the very end may be half of a CRLF: the break before it is the last certain one.
    cr = -1;
    for (let i = text.indexOf('\r', lf + 1); i !== -1 && i < text.length - 1; i = text.indexOf('\r', i + 1))
      cr = i;
  }
  return Math.max(lf, cr);
}

interface Decoded {
  text: string;
  /** Offsets in `text` of replacement characters that stand for invalid bytes, with the byte. */
  bad: number[];
  badBytes: number[];
}

const fatalDecoder = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true });

/** Length of the UTF-8 sequence a lead byte starts, or 0 when it cannot start one. */
function sequenceLength(lead: number): number {
  if (lead < 0x80) return 1;
  if (lead >= 0xc2 && lead <= 0xdf) return 2;
  if (lead >= 0xe0 && lead <= 0xef) return 3;
  if (lead >= 0xf0 && lead <= 0xf4) return 4;
  return 0;
}

/** Whether `bytes[i..]` starts a well-formed sequence of length `len` (Unicode Table 3-7). */
function wellFormedAt(bytes: Uint8Array, i: number, len: number): boolean {
  if (i + len > bytes.length) return false;
  const b0 = bytes[i]!;
  const b1 = bytes[i + 1]!;
  if (len >= 2) {
    let lo = 0x80,
      hi = 0xbf;
    if (b0 === 0xe0) lo = 0xa0;
    else if (b0 === 0xed) hi = 0x9f;
    else if (b0 === 0xf0) lo = 0x90;
    else if (b0 === 0xf4) hi = 0x8f;
    if (b1 < lo || b1 > hi) return false;
  }
  for (let k = 2; k < len; k++) {
    const b = bytes[i + k]!;
    if (b < 0x80 || b > 0xbf) return false;
  }
  return true;
}

/** Decodes bytes known to hold invalid sequences: one U+FFFD per invalid byte, with their offsets. */
function decodeLeniently(bytes: Uint8Array): Decoded {
  const parts: string[] = [];
  const bad: number[] = [];
  const badBytes: number[] = [];
  let length = 0;
  let runStart = 0;
  let i = 0;
  while (i < bytes.length) {
    const len = sequenceLength(bytes[i]!);
    if (len === 1) {
      i++;
      continue;
    }
    if (len > 1 && wellFormedAt(bytes, i, len)) {
      i += len;
      continue;
    }
    if (i > runStart) {
      const run = fatalDecoder.decode(bytes.subarray(runStart, i));
      parts.push(run);
      length += run.length;
    }
    bad.push(length);
    badBytes.push(bytes[i]!);
    parts.push('\ufffd');
    length += 1;
    i++;
    runStart = i;
  }
  if (runStart < bytes.length) parts.push(fatalDecoder.decode(bytes.subarray(runStart)));
  return { text: parts.join(''), bad, badBytes };
}

function decode(bytes: Uint8Array): Decoded {
  try {
    return { text: fatalDecoder.decode(bytes), bad: [], badBytes: [] };
  } catch {
    return decodeLeniently(bytes);
  }
}

/** How many bytes at the end of `bytes` are the start of a sequence that the next chunk completes. */
function incompleteTail(bytes: Uint8Array): number {
  for (let back = 1; back <= 3 && back <= bytes.length; back++) {
    const b = bytes[bytes.length - back]!;
    if (b >= 0x80 && b < 0xc0) continue;
    const len = sequenceLength(b);
    return len > back ? back : 0;
  }
  return 0;
}

function sniff(file: string, head: Uint8Array): void {
  const sample = head.subarray(0, SNIFF_BYTES);
  const nul = sample.indexOf(0);
  const notText = (why: string): PlumbError =>
    new PlumbError('E_INPUT', `${file} does not look like a text graph file (${why})`, {
      position: { file },
      hint: 'plumb reads UTF-8 text: N-Triples, N-Quads, Turtle, TriG, CSV or TSV, optionally gzipped',
    });
  if (nul !== -1) throw notText(`a NUL byte at offset ${nul}`);
  const { bad } = decode(sample.subarray(0, sample.length - incompleteTail(sample)));
  if (bad.length > SNIFF_MAX_INVALID)
    throw notText(`${bad.length} bytes that are not UTF-8 in its first ${sample.length} bytes`);
}

/**
 * Splits a stream of bytes (or strings, for tests) into {@link TextBatch}es. The same path serves
 * files, standard input and tests that feed one or two characters at a time.
 */
export async function* textBatches(
  chunks: AsyncIterable<Uint8Array | string>,
  options: TextOptions,
): AsyncGenerator<TextBatch> {
  const maxLine = options.maxLineLength ?? MAX_LINE_LENGTH;
  const { file, strict } = options;
  let carry: Uint8Array | undefined;
  let started = false;
  let sniffed = false;
  // Text after the last line break, kept as pieces so a long line is joined once, not once per chunk.
  let pending: string[] = [];
  let pendingLength = 0;
  let pendingBad: number[] = [];
  let pendingBadBytes: number[] = [];
  let line = 1;
  let problems: LineProblem[] = [];
  // Set while dropping the rest of an over-long line.
  let skipping = false;

  const problem = (p: LineProblem): void => {
    if (strict) {
      throw new PlumbError('E_PARSE', p.reason, {
        position: { file, line: p.line, column: p.column },
        hint: 'fix or remove that line, or run without --strict to skip such lines and list them',
      });
    }
    problems.push(p);
  };

  function* take(decoded: Decoded): Generator<TextBatch> {
    let { text } = decoded;
    let { bad, badBytes } = decoded;
    if (!started) {
      if (text.length === 0) return;
      started = true;
      if (text.charCodeAt(0) === 0xfeff) {
        text = text.slice(1);
        bad = bad.map((b) => b - 1);
      }
    }
    if (skipping) {
      const cut = firstBreakEnd(text);
      if (cut === -1) return;
      skipping = false;
      // The skipped line stays as an empty line so the numbering holds.
      text = '\n' + text.slice(cut);
      bad = bad.filter((b) => b >= cut).map((b) => b - cut + 1);
      badBytes = badBytes.slice(badBytes.length - bad.length);
    }
    const cut = lastBreak(text);
    if (cut === -1) {
      pending.push(text);
      for (const b of bad) pendingBad.push(b + pendingLength);
      pendingBadBytes.push(...badBytes);
      pendingLength += text.length;
      if (pendingLength > maxLine) {
        const head = pending.join('').slice(0, 200);
        problem({
          line,
          column: 1,
          reason: `line is longer than ${maxLine.toLocaleString('en')} characters`,
          text: clip(head),
        });
        pending = [];
        pendingLength = 0;
        pendingBad = [];
        pendingBadBytes = [];
        skipping = true;
      }
      return;
    }
    const head = text.slice(0, cut + 1);
    const batchBad = pendingBad.concat(bad.filter((b) => b <= cut).map((b) => b + pendingLength));
    const batchBadBytes = pendingBadBytes.concat(badBytes.slice(0, bad.filter((b) => b <= cut).length));
    let batchText = pending.length === 0 ? head : pending.join('') + head;
    const rest = text.slice(cut + 1);
    const restBad = bad.filter((b) => b > cut).map((b) => b - cut - 1);
    pending = rest.length === 0 ? [] : [rest];
    pendingLength = rest.length;
    pendingBad = restBad;
    pendingBadBytes = badBytes.slice(badBytes.length - restBad.length);
    if (batchBad.length > 0) batchText = blankInvalid(batchText, line, batchBad, batchBadBytes);
    const breaks = countBreaks(batchText);
    yield { text: batchText, firstLine: line, breaks, problems };
    problems = [];
    line += breaks;
  }

  function blankInvalid(text: string, firstLine: number, bad: number[], badBytes: number[]): string {
    const out: string[] = [];
    let copied = 0;
    let lastLineStart = -1;
    for (let k = 0; k < bad.length; k++) {
      const at = bad[k]!;
      const start = Math.max(text.lastIndexOf('\n', at), text.lastIndexOf('\r', at)) + 1;
      if (start === lastLineStart) continue;
      lastLineStart = start;
      const content = lineAt(text, start);
      const lineNo = firstLine + countBreaks(text.slice(0, start));
      const byte = badBytes[k]!.toString(16).toUpperCase().padStart(2, '0');
      problem({
        line: lineNo,
        column: at - start + 1,
        reason: `invalid UTF-8 (byte 0x${byte})`,
        text: clip(content),
      });
      out.push(text.slice(copied, start));
      copied = start + content.length;
    }
    out.push(text.slice(copied));
    return out.join('');
  }

  for await (const chunk of withLine(chunks, () => line)) {
    if (typeof chunk === 'string') {
      if (chunk.length > 0) yield* take({ text: chunk, bad: [], badBytes: [] });
      continue;
    }
    if (chunk.length === 0) continue;
    let bytes = chunk;
    if (carry !== undefined) {
      const joined = new Uint8Array(carry.length + chunk.length);
      joined.set(carry);
      joined.set(chunk, carry.length);
      bytes = joined;
      carry = undefined;
    }
    if (!sniffed) {
      sniffed = true;
      sniff(file, bytes);
    }
    const tail = incompleteTail(bytes);
    if (tail > 0) {
      carry = bytes.slice(bytes.length - tail);
      bytes = bytes.subarray(0, bytes.length - tail);
    }
    if (bytes.length > 0) yield* take(decode(bytes));
  }
  if (carry !== undefined) {
    if (!sniffed) sniff(file, carry);
    yield* take(decodeLeniently(carry));
  }
  if (skipping) {
    // The over-long line ran to the end of the input; it is already reported.
    pending = ['\n'];
    pendingLength = 1;
    skipping = false;
  }
  if (pendingLength > 0 || problems.length > 0) {
    let text = pending.join('');
    if (pendingBad.length > 0) text = blankInvalid(text, line, pendingBad, pendingBadBytes);
    yield { text, firstLine: line, breaks: countBreaks(text), problems };
  }
}

/** Offset just after the first line break of `text`, or -1. */
function firstBreakEnd(text: string): number {
  const lf = text.indexOf('\n');
  const cr = text.indexOf('\r');
  if (cr !== -1 && (lf === -1 || cr < lf)) return text.charCodeAt(cr + 1) === 10 ? cr + 2 : cr + 1;
  return lf === -1 ? -1 : lf + 1;
}

/** Adds the line reached to an input error that knows only the file (a truncated .gz, a read error). */
async function* withLine<T>(chunks: AsyncIterable<T>, line: () => number): AsyncGenerator<T> {
  try {
    yield* chunks;
  } catch (error) {
    if (error instanceof PlumbError && error.position !== undefined && error.position.line === undefined) {
      const options = { position: { ...error.position, line: line() }, cause: error };
      throw new PlumbError(
        error.code,
        error.message,
        error.hint === undefined ? options : { ...options, hint: error.hint },
      );
    }
    throw error;
  }
}

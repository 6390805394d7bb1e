import { CsvError, Parser, type Options as CsvOptions } from 'csv-parse';
import { PlumbError } from '../errors.js';
import { literalKey, RDF, XSD } from '../graph/terms.js';
import { RetainedText } from './retained.js';
import type { FileSink } from './sink.js';
import { countBreaks, type TextBatch } from './text.js';

/**
 * CSV (RFC 4180) and TSV edge lists through `csv-parse`.
 *
 * Columns: `subject,predicate,object[,graph]` by header name or by 0-based position; without a
 * mapping, a header naming the roles (subject/predicate/object, head/relation/tail, s/p/o, …) is used,
 * else the first three columns. A header row is expected when the mapping uses names; otherwise it
 * is recognised by those role names (or forced with `header`).
 *
 * Cells to terms, in this order:
 * 1. `<…>` is an IRI, `_:label` a blank node (distinct per file);
 * 2. a cell in N-Triples literal form — `"text"`, `"text"@lang`, `"5"^^<datatype>` or
 *    `"5"^^xsd:integer` — is that literal (objects only);
 * 3. an absolute IRI (`scheme:rest`, no spaces) is itself;
 * 4. a bare token (no spaces, none of `<>"{}|^\``) becomes an IRI under the base IRI — numbers
 *    too, because link-prediction datasets name entities by number;
 * 5. anything else: in the object column a plain string literal; in the subject or predicate column
 *    an IRI under the base with the offending characters percent-encoded.
 * A literal or an empty cell where a subject or predicate belongs rejects the row.
 *
 * TSV has no quoting (as the IANA text/tab-separated-values type defines it); CSV has RFC 4180
 * quoting, with a stray quote inside an unquoted field taken literally. Lines starting with `#` are
 * comments, blank lines are skipped. Each row is one statement; a row that cannot be parsed is
 * rejected and reading resumes on the next line (after an unclosed quote, on the line after the one
 * where the row began).
 */

export const DEFAULT_BASE_IRI = 'urn:plumb:';

const ROLE_NAMES: readonly (readonly string[])[] = [
  ['subject', 's', 'head', 'h', 'source', 'from', 'sub'],
  ['predicate', 'p', 'relation', 'rel', 'r', 'property', 'edge', 'verb'],
  ['object', 'o', 'tail', 't', 'target', 'to', 'obj', 'value'],
  ['graph', 'g', 'context'],
];

type ColumnRef = { index: number } | { name: string };

export interface CsvReadContext {
  sink: FileSink;
  format: 'csv' | 'tsv';
  columns: string | undefined;
  delimiter: string | undefined;
  header: boolean | undefined;
  baseIri: string | undefined;
}

/** Parses `--columns`: 3 or 4 comma-separated names or 0-based positions. */
export function parseColumns(spec: string): ColumnRef[] {
  const parts = spec.split(',').map((p) => p.trim());
  if (parts.length < 3 || parts.length > 4 || parts.some((p) => p === '')) {
    throw new PlumbError(
      'E_USAGE',
      `--columns needs 3 or 4 comma-separated names or positions, got "${spec}"`,
      {
        hint: 'e.g. --columns subject,predicate,object or --columns 0,1,2 (a fourth names the graph)',
      },
    );
  }
  return parts.map((p) => (/^\d+$/.test(p) ? { index: Number(p) } : { name: p }));
}

/** `\t`, `tab`, `\\t` and the character itself all mean a tab. */
export function parseDelimiter(text: string): string {
  const named: Record<string, string> = {
    '\\t': '\t',
    tab: '\t',
    comma: ',',
    semicolon: ';',
    pipe: '|',
    space: ' ',
  };
  const delimiter = named[text.toLowerCase()] ?? text;
  if (delimiter.length === 0 || /[\r\n"]/.test(delimiter)) {
    throw new PlumbError('E_USAGE', `--delimiter cannot be ${JSON.stringify(text)}`, {
      hint: 'use a character such as , ; | or \\t',
    });
  }
  return delimiter;
}

interface CsvApi {
  parse(
    buffer: Buffer | undefined,
    end: boolean,
    push: () => void,
    close: () => void,
  ): (Error & { code?: string; lines?: number }) | undefined;
}

export async function readCsv(batches: AsyncIterable<TextBatch>, context: CsvReadContext): Promise<void> {
  const reader = new CsvReader(context);
  for await (const batch of batches) reader.push(batch);
  reader.end();
}

class CsvReader {
  private readonly sink: FileSink;
  private readonly terms;
  private readonly options: CsvOptions;
  private readonly baseIri: string;
  private readonly blankPrefix: string;
  private readonly requested: ColumnRef[] | undefined;
  private readonly header: boolean | undefined;
  /** Resolved positions of subject, predicate, object and graph (-1: none); undefined until the first row. */
  private positions: number[] | undefined;

  private api!: CsvApi;
  private lineOffset = 0;
  private crlfInQuotes = 0;
  /** Absolute line on which the last complete row ended. */
  private lastEnd = 0;
  private ended = false;
  private failure: (Error & { code?: string; lines?: number }) | undefined;
  private readonly retained = new RetainedText();
  private readonly problemLines = new Set<number>();

  constructor(context: CsvReadContext) {
    this.sink = context.sink;
    this.terms = context.sink.builder.terms;
    this.baseIri = context.baseIri ?? DEFAULT_BASE_IRI;
    this.blankPrefix = `_:f${context.sink.fileIndex}_`;
    this.requested = context.columns === undefined ? undefined : parseColumns(context.columns);
    if (this.requested?.some((c) => 'name' in c) && context.header === false) {
      throw new PlumbError(
        'E_USAGE',
        '--columns names columns by header, but --no-header says there is none',
        {
          hint: 'give positions instead (e.g. --columns 0,1,2), or drop --no-header',
        },
      );
    }
    this.header = this.requested?.some((c) => 'name' in c) ? true : context.header;
    const tsv = context.format === 'tsv';
    this.options = {
      delimiter: context.delimiter === undefined ? (tsv ? '\t' : ',') : parseDelimiter(context.delimiter),
      quote: tsv ? false : '"',
      record_delimiter: ['\r\n', '\n', '\r'],
      relax_column_count: true,
      relax_quotes: true,
      skip_empty_lines: true,
      comment: '#',
      comment_no_infix: true,
      bom: false,
      on_record: (record: string[], info: { lines: number }) => {
        this.row(record, info.lines);
        return null;
      },
    } as CsvOptions;
    this.start(1);
  }

  push(batch: TextBatch): void {
    for (const p of batch.problems) {
      this.problemLines.add(p.line);
      this.sink.reject(p.line, p.column, p.reason, p.text);
    }
    this.retained.push(batch);
    this.write(batch.text);
    this.settle();
    this.retained.dropBefore(this.lastEnd + 1);
  }

  end(): void {
    this.ended = true;
    this.finish();
    this.settle();
  }

  private start(line: number): void {
    this.api = (new Parser(this.options) as unknown as { api: CsvApi }).api;
    this.lineOffset = line - 1;
    this.crlfInQuotes = 0;
  }

  private write(text: string): void {
    if (this.failure !== undefined || text.length === 0) return;
    this.failure = syntaxOnly(this.api.parse(Buffer.from(text), false, noop, noop));
  }

  private finish(): void {
    if (this.failure !== undefined) return;
    this.failure = syntaxOnly(this.api.parse(undefined, true, noop, noop));
  }

  private settle(): void {
    while (this.failure !== undefined) {
      const error = this.failure;
      this.failure = undefined;
      const errorLine = this.lineOffset + (error.lines ?? 1) - this.crlfInQuotes;
      let line = errorLine;
      let resume = errorLine + 1;
      let reason: string;
      if (error.code === 'CSV_QUOTE_NOT_CLOSED') {
        // The row took the rest of the input as one field: give up only the line where it began.
        const begin = this.retained.find(this.lastEnd + 1, (c) => c.trim() !== '' && !c.startsWith('#'));
        if (begin !== -1) line = begin;
        resume = line + 1;
        reason = 'a quoted field is never closed';
      } else if (
        error.code === 'CSV_INVALID_CLOSING_QUOTE' ||
        error.code === 'CSV_NON_TRIMABLE_CHAR_AFTER_CLOSING_QUOTE'
      ) {
        reason = 'a closing quote is followed by more text (inside a quoted field, write a quote as "")';
      } else {
        reason = error.message.replace(/ (at|on) line \d+/g, '');
      }
      const text = this.retained.line(line);
      if (!this.problemIn(this.lastEnd + 1, errorLine)) {
        const quote = text.indexOf('"');
        this.sink.reject(line, quote >= 0 ? quote + 1 : 1, reason, text);
      }
      this.lastEnd = Math.max(this.lastEnd, resume - 1);
      this.start(resume);
      for (const piece of this.retained.from(resume)) {
        this.write(piece);
        if (this.failure !== undefined) break;
      }
      if (this.failure === undefined && this.ended) this.finish();
    }
  }

  private problemIn(from: number, to: number): boolean {
    if (this.problemLines.size === 0) return false;
    for (let line = from; line <= to; line++) if (this.problemLines.has(line)) return true;
    return false;
  }

  private row(cells: string[], lastLine: number): void {
    let breaks = 0;
    for (const cell of cells) {
      if (!cell.includes('\n') && !cell.includes('\r')) continue;
      breaks += countBreaks(cell);
      // csv-parse counts a CRLF inside quotes as two lines; keep its count honest.
      for (let i = cell.indexOf('\r\n'); i !== -1; i = cell.indexOf('\r\n', i + 2)) this.crlfInQuotes++;
    }
    const end = this.lineOffset + lastLine - this.crlfInQuotes;
    const line = end - breaks;
    this.lastEnd = end;
    if (cells.every((c) => c.trim() === '')) return;
    if (this.positions === undefined) {
      this.positions = this.resolveColumns(cells);
      if (this.isHeader(cells)) return;
    }
    const [si, pi, oi, gi] = this.positions as [number, number, number, number];
    const needed = Math.max(si, pi, oi, gi) + 1;
    const text = () => this.retained.line(line);
    if (cells.length < needed) {
      this.sink.reject(
        line,
        1,
        `the row has ${cells.length} cell${cells.length === 1 ? '' : 's'}, the column mapping needs ${needed}`,
        text(),
      );
      return;
    }
    const s = this.resource(cells[si]!, 'subject');
    const p = this.resource(cells[pi]!, 'predicate');
    const o = this.object(cells[oi]!);
    const g = gi < 0 || cells[gi]!.trim() === '' ? -1 : this.resource(cells[gi]!, 'graph');
    for (const [id, column] of [
      [s, si],
      [p, pi],
      [o, oi],
      [g, gi],
    ] as const) {
      if (typeof id === 'string') {
        this.sink.reject(line, this.columnOf(cells, column), id, text());
        return;
      }
    }
    this.sink.add(s as number, p as number, o as number, g as number, line);
  }

  /** 1-based character column where cell `index` starts (exact for unquoted rows). */
  private columnOf(cells: string[], index: number): number {
    const delimiter = this.options.delimiter as string;
    let column = 1;
    for (let k = 0; k < index; k++) column += cells[k]!.length + delimiter.length;
    return column;
  }

  private isHeader(cells: string[]): boolean {
    if (this.header !== undefined) return this.header;
    const [si, pi, oi] = this.positions as [number, number, number];
    const named = (cell: string | undefined, role: number) =>
      cell !== undefined && ROLE_NAMES[role]!.includes(cell.trim().toLowerCase());
    return named(cells[si], 0) && named(cells[pi], 1) && named(cells[oi], 2);
  }

  /** Maps the column references to positions, using the first row when it is (or may be) a header. */
  private resolveColumns(first: string[]): number[] {
    const names = first.map((c) => c.trim());
    const lower = names.map((c) => c.toLowerCase());
    if (this.requested !== undefined) {
      const positions = this.requested.map((ref) => {
        if ('index' in ref) return ref.index;
        let at = names.indexOf(ref.name);
        if (at < 0) at = lower.indexOf(ref.name.toLowerCase());
        if (at < 0) {
          throw new PlumbError('E_USAGE', `column "${ref.name}" is not in the header of ${this.sink.file}`, {
            position: { file: this.sink.file, line: 1 },
            hint: `its header has: ${names.join(', ')}`,
          });
        }
        return at;
      });
      if (positions.length === 3) positions.push(-1);
      return positions;
    }
    if (this.header !== false) {
      const found = ROLE_NAMES.map((role) => lower.findIndex((c) => role.includes(c)));
      if (found[0]! >= 0 && found[1]! >= 0 && found[2]! >= 0) return found;
    }
    return [0, 1, 2, -1];
  }

  /** A subject, predicate or graph cell: an id, or the reason it cannot be one. */
  private resource(raw: string, role: 'subject' | 'predicate' | 'graph'): number | string {
    const cell = raw.trim();
    if (cell === '') return `empty ${role} cell`;
    const c = cell.charCodeAt(0);
    if (c === 60 /* < */) {
      const iri = this.bracketed(cell);
      return iri ?? `malformed IRI in the ${role} cell: ${cell}`;
    }
    if (c === 95 /* _ */ && cell.startsWith('_:')) {
      if (role === 'predicate') return 'a blank node cannot be a predicate';
      return this.terms.intern(this.blankPrefix + cell.slice(2));
    }
    if (c === 34 /* " */ && LITERAL.test(cell)) return `a literal cannot be a ${role}: ${cell}`;
    if (ABSOLUTE_IRI.test(cell)) return this.terms.intern(cell);
    if (BARE.test(cell)) return this.terms.intern(this.baseIri + cell);
    return this.terms.intern(this.baseIri + percentEncode(cell));
  }

  private object(raw: string): number | string {
    const cell = raw.trim();
    if (cell === '') return 'empty object cell';
    const c = cell.charCodeAt(0);
    if (c === 60 /* < */) {
      const iri = this.bracketed(cell);
      return iri ?? `malformed IRI in the object cell: ${cell}`;
    }
    if (c === 95 /* _ */ && cell.startsWith('_:') && BARE.test(cell))
      return this.terms.intern(this.blankPrefix + cell.slice(2));
    if (c === 34 /* " */) {
      const m = LITERAL.exec(cell);
      if (m !== null) {
        const lexical = unescapeString(m[1]!);
        const datatype = m[3] ?? (m[4] !== undefined ? (m[4] === 'xsd' ? XSD : RDF) + m[5]! : undefined);
        return this.terms.intern(literalKey(lexical, datatype, m[2]));
      }
    }
    if (ABSOLUTE_IRI.test(cell)) return this.terms.intern(cell);
    if (BARE.test(cell)) return this.terms.intern(this.baseIri + cell);
    return this.terms.intern(literalKey(raw));
  }

  private bracketed(cell: string): number | undefined {
    if (!cell.endsWith('>')) return undefined;
    const iri = cell.slice(1, -1);
    if (!IRI_BODY.test(iri)) return undefined;
    return this.terms.intern(iri);
  }
}

const ABSOLUTE_IRI = /^[A-Za-z][A-Za-z0-9+.-]*:[^\s<>"{}|\\^`]*$/;
const BARE = /^[^\s<>"{}|\\^`]+$/;
const IRI_BODY = /^[^\s<>"{}|\\^`]*$/;
const LITERAL =
  /^"((?:[^"\\]|\\[\s\S])*)"(?:@([A-Za-z]+(?:-[A-Za-z0-9]+)*)|\^\^<([^\s<>"{}|\\^`]*)>|\^\^(xsd|rdf):([A-Za-z_][\w.-]*))?$/;

const STRING_ESCAPES: Record<string, string> = {
  t: '\t',
  b: '\b',
  n: '\n',
  r: '\r',
  f: '\f',
  '"': '"',
  "'": "'",
  '\\': '\\',
};

/** N-Triples string escapes (ECHAR, UCHAR) to characters; an unknown escape stays as written. */
function unescapeString(text: string): string {
  if (!text.includes('\\')) return text;
  return text.replace(/\\(u[0-9A-Fa-f]{4}|U[0-9A-Fa-f]{8}|[\s\S])/g, (whole, e: string) => {
    if (e.length > 1) {
      const code = parseInt(e.slice(1), 16);
      return code <= 0x10ffff && (code < 0xd800 || code > 0xdfff) ? String.fromCodePoint(code) : whole;
    }
    return STRING_ESCAPES[e] ?? whole;
  });
}

function percentEncode(text: string): string {
  return text.replace(/[\s<>"{}|\\^`]/g, (ch) =>
    Array.from(Buffer.from(ch, 'utf8'), (b) => `%${b.toString(16).toUpperCase().padStart(2, '0')}`).join(''),
  );
}

function noop(): void {}

/** csv-parse hands back what a record callback throws; only its own syntax errors are the reader's to handle. */
function syntaxOnly(
  error: (Error & { code?: string; lines?: number }) | undefined,
): (Error & { code?: string; lines?: number }) | undefined {
  if (error === undefined || error instanceof CsvError) return error;
  throw error;
}

import { DataFactory, Parser } from 'n3';
import { PlumbError } from '../errors.js';
import type { TermDictionary } from '../graph/terms.js';
import { literalKey } from '../graph/terms.js';
import type { FileSink } from './sink.js';
import { RetainedText } from './retained.js';
import type { TextBatch } from './text.js';

/**
 * N-Triples, N-Quads, Turtle and TriG through `n3`'s streaming parser, fed line-aligned batches of
 * text by a thin adapter so that a syntax error never ends the read.
 *
 * Recovery. `n3` stops at the first error; the reader records it and starts a fresh parser further on:
 * - N-Triples and N-Quads (one statement per line): the line where the broken statement began is
 *   rejected, and reading resumes on the next line. When the parser only noticed the problem on a
 *   later line (a statement without its final `.`), that later line is read again from its start.
 * - Turtle and TriG: the error is recorded where the parser stopped, and reading resumes after the
 *   next line that ends a statement (its last non-comment character is `.`); inside a TriG graph
 *   block `{ … }` it resumes after the line that closes the block, so no triple lands in the wrong
 *   graph. Everything skipped counts as that one rejected statement; triples of the broken statement
 *   that were complete before the error stay accepted. The prefixes and base IRIs declared so far
 *   carry over to the fresh parser.
 * Each emitted triple counts as one statement; each error as one rejected statement. The line of a
 * triple is the line of the token that completed it (its `.`, `;` or `,`).
 */

/** No IRI holds a NUL character, so this never equals one. */
const NO_IRI = '\u0000';

type RdfFormat = 'ntriples' | 'nquads' | 'turtle' | 'trig';

const N3_FORMAT: Record<RdfFormat, string> = {
  ntriples: 'N-Triples',
  nquads: 'N-Quads',
  turtle: 'Turtle',
  trig: 'TriG',
};

interface N3Token {
  type: string;
  value: string;
  line: number;
  start: number;
}

interface N3Error extends Error {
  context?: { token?: N3Token; line?: number };
}

interface N3Term {
  readonly termType: string;
  readonly value: string;
  readonly language?: string;
  readonly direction?: string;
  readonly datatype?: { readonly value: string };
}

interface N3Quad {
  readonly subject: N3Term;
  readonly predicate: N3Term;
  readonly object: N3Term;
  readonly graph: N3Term;
}

/** The part of `n3`'s parser used here; `onToken` is newer than the published typings. */
interface N3Parser {
  parse(
    input: Feed,
    callbacks: {
      onQuad(error: N3Error | null, quad: N3Quad | null): void;
      onPrefix(prefix: string, iri: N3Term): void;
      onToken(token: N3Token): void;
    },
  ): void;
}

/** The event source `n3` reads from; data is pushed synchronously, so the parser runs inside `data()`. */
class Feed {
  private onData: ((text: string) => void) | undefined;
  private onEnd: (() => void) | undefined;
  on(event: string, listener: (...args: never[]) => void): this {
    if (event === 'data') this.onData = listener as (text: string) => void;
    else if (event === 'end') this.onEnd = listener as () => void;
    return this;
  }
  data(text: string): void {
    if (text.length > 0) this.onData?.(text);
  }
  end(): void {
    this.onEnd?.();
  }
}

export interface RdfReadContext {
  sink: FileSink;
  format: RdfFormat;
  /** Resolves relative IRIs in Turtle and TriG. */
  baseIri: string | undefined;
}

export async function readRdf(batches: AsyncIterable<TextBatch>, context: RdfReadContext): Promise<void> {
  const reader = new RdfReader(context);
  for await (const batch of batches) reader.push(batch);
  reader.end();
}

interface Failure {
  error: N3Error;
  /** Absolute line where the parser stopped. */
  line: number;
}

class RdfReader {
  private readonly sink: FileSink;
  private readonly terms: TermDictionary;
  private readonly format: RdfFormat;
  private readonly lineMode: boolean;
  private readonly baseIri: string | undefined;
  private readonly blankPrefix: string;
  private readonly factory: typeof DataFactory;

  private parser!: N3Parser;
  private feed!: Feed;
  /** Absolute line = lineOffset + the parser's own line. */
  private lineOffset = 0;
  private failure: Failure | null = null;
  private ended = false;

  // What the tokens so far say about the statement being read.
  private tokenLine = 1;
  private open = false;
  private startLine = 1;
  private depth = 0;
  private awaitingBase = false;
  private sparqlDirective = false;
  private readonly bases: string[] = [];
  private readonly prefixes = new Map<string, string>();

  /** Line-based formats: the last quad read, held until its statement's "." (0: none). */
  private readonly pending = new Int32Array(4);
  private pendingLine = 0;
  private previousType = '';
  private lastSubject = NO_IRI;
  private lastSubjectId = -1;
  private readonly predicateIds = new Map<string, number>();
  /** Text from the current statement's start, so any line can be read again. */
  private readonly retained = new RetainedText();
  /** Lines the text layer already rejected; a syntax error they cause is not counted twice. */
  private readonly problemLines = new Set<number>();
  /** While skipping a broken Turtle statement: the character that ends it. */
  private skipUntil: '.' | '}' | null = null;

  constructor(context: RdfReadContext) {
    this.sink = context.sink;
    this.terms = context.sink.builder.terms;
    this.format = context.format;
    this.lineMode = context.format === 'ntriples' || context.format === 'nquads';
    this.baseIri = context.baseIri;
    // Labels are made distinct per file; unlabelled nodes (`[]`, lists) get a form no label can take.
    this.blankPrefix = `f${context.sink.fileIndex}_`;
    let anonymous = 0;
    const anonymousPrefix = `f${context.sink.fileIndex}-`;
    this.factory = {
      ...DataFactory,
      blankNode: (name?: string) => DataFactory.blankNode(name || `${anonymousPrefix}${anonymous++}`),
    };
    this.start(1);
  }

  push(batch: TextBatch): void {
    for (const p of batch.problems) {
      this.problemLines.add(p.line);
      this.sink.reject(p.line, p.column, p.reason, p.text);
    }
    this.retained.push(batch);
    if (this.skipUntil !== null) {
      const closer = this.findCloser(batch.firstLine, this.skipUntil);
      if (closer !== -1) {
        this.skipUntil = null;
        this.restartAt(closer + 1);
      }
    } else {
      this.send(batch.text);
    }
    this.settle();
    this.trimRetained();
  }

  end(): void {
    this.ended = true;
    if (this.skipUntil === null) {
      this.send(null);
      this.settle();
    }
    if (this.pendingLine !== 0 && this.previousType === '.') this.commit();
  }

  /** A fresh parser whose first line is absolute line `line`. */
  private start(line: number): void {
    this.parser = new Parser({
      format: N3_FORMAT[this.format],
      baseIRI: this.baseIri,
      blankNodePrefix: this.blankPrefix,
      factory: this.factory,
    }) as unknown as N3Parser;
    this.feed = new Feed();
    this.open = false;
    this.depth = 0;
    this.awaitingBase = false;
    this.sparqlDirective = false;
    this.tokenLine = line;
    this.startLine = line;
    this.previousType = '';
    this.parser.parse(this.feed, {
      onQuad: (error, quad) => (error ? this.fail(error) : quad && this.quad(quad)),
      onPrefix: (prefix, iri) => this.prefixes.set(prefix, iri.value),
      onToken: (token) => this.token(token),
    });
    const preamble = this.preamble();
    this.lineOffset = line - (preamble === '' ? 1 : 2);
    if (preamble !== '') this.send(preamble);
  }

  /** Feeds text to the parser (null: the end of the input). */
  private send(text: string | null): void {
    try {
      if (text === null) this.feed.end();
      else this.feed.data(text);
    } catch (error) {
      if (error instanceof PlumbError) throw error;
      // n3 can trip over its own state right after reporting an error (e.g. an invalid IRI in a prefix
      // declaration); what it reported first stands. Anything else becomes a rejection, not a crash.
      if (this.failure === null) {
        const message = error instanceof Error ? error.message : String(error);
        this.failure = { error: new Error(`the parser failed: ${message}`), line: this.tokenLine };
      }
    }
  }

  /** The declarations in force so far, on one line, for a parser that starts mid-file. */
  private preamble(): string {
    if (this.lineMode || (this.bases.length === 0 && this.prefixes.size === 0)) return '';
    const parts = this.bases.map((b) => `@base <${b}> .`);
    for (const [prefix, iri] of this.prefixes) parts.push(`@prefix ${prefix}: <${iri}> .`);
    return `${parts.join(' ')}\n`;
  }

  private token(token: N3Token): void {
    const line = this.lineOffset + token.line;
    this.tokenLine = line;
    if (this.pendingLine !== 0 && this.previousType === '.') this.commit();
    this.previousType = token.type;
    switch (token.type) {
      case '.':
        this.open = false;
        return;
      case '{':
        this.depth++;
        this.open = false;
        return;
      case '}':
        this.depth--;
        this.open = false;
        return;
      case 'eof':
        return;
    }
    if (!this.open) {
      this.open = true;
      this.startLine = line;
    }
    if (this.lineMode) return;
    switch (token.type) {
      case '@base':
        this.awaitingBase = true;
        break;
      case 'BASE':
        this.awaitingBase = this.sparqlDirective = true;
        break;
      case 'PREFIX':
        this.sparqlDirective = true;
        break;
      case 'IRI':
        if (this.awaitingBase) {
          this.bases.push(token.value);
          this.awaitingBase = false;
        }
        // SPARQL-style directives end without a dot.
        if (this.sparqlDirective) this.open = this.sparqlDirective = false;
        break;
    }
  }

  private quad(quad: N3Quad): void {
    const line = this.tokenLine;
    // Dumps group triples by subject and use few predicates: both skip most dictionary lookups.
    const subject = quad.subject;
    let s: number;
    if (subject.termType === 'NamedNode' && subject.value === this.lastSubject) s = this.lastSubjectId;
    else {
      s = this.termId(subject);
      this.lastSubject = subject.termType === 'NamedNode' ? subject.value : NO_IRI;
      this.lastSubjectId = s;
    }
    const predicate = quad.predicate;
    let p = this.predicateIds.get(predicate.value);
    if (p === undefined) {
      p = this.termId(predicate);
      if (predicate.termType === 'NamedNode' && this.predicateIds.size < 4096)
        this.predicateIds.set(this.terms.key(p), p);
    }
    const o = this.termId(quad.object);
    const g = quad.graph.termType === 'DefaultGraph' ? -1 : this.termId(quad.graph);
    if (s < 0 || o < 0 || g < -1) {
      const text = this.lineText(line);
      this.sink.reject(
        line,
        1,
        'a triple term (RDF 1.2) cannot be held in the graph; plumb reads RDF 1.1 triples',
        text,
      );
      return;
    }
    if (this.format === 'nquads') {
      // n3 emits a quad as soon as its graph name is read, before the final ".", so an N-Quads
      // statement counts only once its line proves well-formed. (N-Triples emit on the ".".)
      this.pending[0] = s;
      this.pending[1] = p;
      this.pending[2] = o;
      this.pending[3] = g;
      this.pendingLine = line;
    } else this.sink.add(s, p, o, g, line);
  }

  private commit(): void {
    const q = this.pending;
    this.sink.add(q[0]!, q[1]!, q[2]!, q[3]!, this.pendingLine);
    this.pendingLine = 0;
  }

  /** The dictionary id of a term; -2 for a triple term, which the store cannot hold. */
  private termId(term: N3Term): number {
    switch (term.termType) {
      case 'NamedNode':
        return this.terms.intern(term.value);
      case 'BlankNode':
        return this.terms.intern(`_:${term.value}`);
      case 'Literal': {
        const language = term.direction ? `${term.language}--${term.direction}` : term.language;
        return this.terms.intern(literalKey(term.value, term.datatype?.value, language));
      }
      default:
        return -2;
    }
  }

  private fail(error: N3Error): void {
    // A quad not yet committed belongs to the statement that failed, unless its "." was read and the
    // failure lies in what follows (a lexer error reports no token of its own).
    if (this.pendingLine !== 0 && this.previousType === '.') this.commit();
    this.pendingLine = 0;
    const relative = error.context?.token?.line ?? error.context?.line;
    const line = relative === undefined ? this.tokenLine : this.lineOffset + relative;
    this.failure ??= { error, line };
  }

  /** Records each failure and resumes past it, until the text at hand reads cleanly. */
  private settle(): void {
    while (this.failure !== null) {
      const failure = this.failure;
      this.failure = null;
      if (this.lineMode) this.recoverLine(failure);
      else this.recoverStatement(failure);
    }
  }

  /** Where the failed statement began: the open statement's first line, or the error's line. */
  private failedStart(failure: Failure): number {
    // The token that closes a statement ends it before the parser can object to it.
    const closing = failure.error.context?.token?.type;
    const open = this.open || closing === '.' || closing === '}';
    return open ? Math.min(this.startLine, failure.line) : failure.line;
  }

  private recoverLine(failure: Failure): void {
    const errorLine = failure.line;
    const startLine = this.failedStart(failure);
    const text = this.lineText(startLine);
    if (!this.problemIn(startLine, errorLine)) {
      // A statement cut short at its line's end: point just past the line's content.
      const { column, reason } =
        startLine < errorLine
          ? { column: text.length + 1, reason: describe(failure.error, text).reason }
          : describe(failure.error, text);
      this.sink.reject(startLine, column, reason, text);
    }
    this.restartAt(startLine < errorLine ? errorLine : errorLine + 1);
  }

  private recoverStatement(failure: Failure): void {
    const errorLine = failure.line;
    const startLine = this.failedStart(failure);
    const closer: '.' | '}' = this.format === 'trig' && this.depth > 0 ? '}' : '.';
    const text = this.lineText(errorLine);
    if (!this.problemIn(startLine, errorLine)) {
      const { column, reason } = describe(failure.error, text);
      const where = startLine < errorLine ? ` (in the statement from line ${startLine})` : '';
      this.sink.reject(errorLine, column, `${reason}${where}`, text);
    }
    // A block's closing brace that the parser refused still closes the block.
    const end = failure.error.context?.token?.type === '}' ? errorLine : this.findCloser(errorLine, closer);
    if (end === -1) this.skipUntil = closer;
    else this.restartAt(end + 1);
  }

  private problemIn(from: number, to: number): boolean {
    if (this.problemLines.size === 0) return false;
    for (let line = from; line <= to; line++) if (this.problemLines.has(line)) return true;
    return false;
  }

  /** Starts a fresh parser at absolute line `line` and feeds it the retained text from there. */
  private restartAt(line: number): void {
    this.start(line);
    for (const piece of this.textFrom(line)) {
      this.send(piece);
      if (this.failure !== null) return;
    }
    if (this.ended) this.send(null);
  }

  private textFrom(line: number): Iterable<string> {
    return this.retained.from(line);
  }

  private lineText(line: number): string {
    return this.retained.line(line);
  }

  /** The first line at or after `from` that ends a statement (or a TriG block); -1 if none is read yet. */
  private findCloser(from: number, closer: '.' | '}'): number {
    return this.retained.find(from, (content) => endsWith(content, closer));
  }

  /** Forgets text before anything the reader may need to read again. */
  private trimRetained(): void {
    const keepFrom = this.skipUntil !== null ? Infinity : this.open ? this.startLine : this.tokenLine;
    this.retained.dropBefore(keepFrom);
  }
}

/** Whether a line's last character outside a trailing comment is `closer`. */
function endsWith(line: string, closer: string): boolean {
  let text = line.trimEnd();
  const comment = text.search(/\s#[^"'<>]*$/);
  if (comment >= 0) text = text.slice(0, comment).trimEnd();
  return text.endsWith(closer);
}

/** The parser's reason without its own (relative) line number, and the 1-based column it points at. */
function describe(error: N3Error, lineText: string): { column: number; reason: string } {
  let reason = error.message.replace(/ on line \d+\.?$/, '');
  const token = error.context?.token;
  if (token !== undefined) return { column: token.start + 1, reason };
  const unexpected = /^Unexpected "([\s\S]*)"$/.exec(reason);
  if (unexpected === null) return { column: 1, reason };
  const snippet = unexpected[1]!;
  const at = snippet === '' ? -1 : lineText.indexOf(snippet);
  if (snippet.startsWith('<') && !snippet.includes('>')) reason = `unterminated IRI: ${reason}`;
  else if (snippet.startsWith('"') || snippet.startsWith("'"))
    reason = `unterminated or malformed string: ${reason}`;
  return { column: at >= 0 ? at + 1 : 1, reason };
}

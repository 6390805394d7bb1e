import { TermDictionary, TermKind } from './terms.js';

/**
 * Compressed sparse rows over term ids: the triples whose subject (or object, or predicate) is term
 * `t` are `triples[offsets[t] .. offsets[t + 1])`, in ascending triple order.
 */
export interface Csr {
  readonly offsets: Int32Array;
  readonly triples: Int32Array;
}

/** Where a triple was read: `files[file[i]]`, line `line[i]` (1-based). */
export interface Provenance {
  readonly files: readonly string[];
  readonly file: Uint16Array;
  readonly line: Uint32Array;
}

/**
 * The in-memory graph: unique triples as integer columns over one term dictionary, with CSR
 * indexes built once. Triple `i` is (s[i], p[i], o[i]) in named graph g[i] (-1: the default graph).
 * Nothing here holds a string per triple.
 */
export interface Graph {
  readonly terms: TermDictionary;
  readonly size: number;
  readonly s: Int32Array;
  readonly p: Int32Array;
  readonly o: Int32Array;
  readonly g: Int32Array;
  readonly provenance: Provenance;
  readonly bySubject: Csr;
  readonly byObject: Csr;
  readonly byPredicate: Csr;
}

/** Grows an Int32Array-backed column without holding a JS array of numbers. */
class Column<T extends Int32Array | Uint32Array | Uint16Array> {
  data: T;
  length = 0;
  constructor(private readonly make: (n: number) => T) {
    this.data = make(1024);
  }
  /** Makes room for `n` values in all, so that reading a large file grows the column once. */
  reserve(n: number): void {
    if (n <= this.data.length) return;
    const next = this.make(n);
    next.set(this.data.subarray(0, this.length));
    this.data = next;
  }
  push(v: number): void {
    if (this.length === this.data.length) {
      const next = this.make(this.data.length * 2);
      next.set(this.data);
      this.data = next;
    }
    this.data[this.length++] = v;
  }
  /** The values as an array of exactly their length; a copy when the buffer has spare room, so the spare room can be freed. */
  trimmed(): T {
    return this.data.length === this.length ? this.data : (this.data.slice(0, this.length) as T);
  }
  release(): void {
    this.data = this.make(0);
    this.length = 0;
  }
}

function hashTriple(s: number, p: number, o: number, g: number): number {
  let h = Math.imul(s, 0x9e3779b1) ^ Math.imul(p + 0x7f4a7c15, 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 15), 0x2c1b3c6d) ^ Math.imul(o, 0xc2b2ae35) ^ Math.imul(g + 1, 0x27d4eb2f);
  h ^= h >>> 13;
  return Math.imul(h, 0x165667b1) ^ (h >>> 16);
}

/**
 * Accumulates triples, dropping exact duplicates (same s, p, o and graph) with an open-addressing
 * hash set, then freezes into a {@link Graph}. Each slot holds the triple's hash next to its index
 * (`table[2k] = hash`, `table[2k + 1] = index + 1`, 0 when empty), so a probe reads the columns only
 * when the hashes agree and growing never rehashes a triple: on a large graph every avoided read is
 * a cache miss avoided.
 */
export class GraphBuilder {
  readonly terms: TermDictionary;
  private readonly s = new Column((n) => new Int32Array(n));
  private readonly p = new Column((n) => new Int32Array(n));
  private readonly o = new Column((n) => new Int32Array(n));
  private readonly g = new Column((n) => new Int32Array(n));
  private readonly file = new Column((n) => new Uint16Array(n));
  private readonly line = new Column((n) => new Uint32Array(n));
  private readonly files: string[] = [];
  private table = new Int32Array(2 * 2048);
  private mask = 2047;
  duplicates = 0;

  constructor(terms: TermDictionary = new TermDictionary()) {
    this.terms = terms;
  }

  /** Registers an input file and returns its index for {@link add}. */
  addFile(name: string): number {
    if (this.files.length >= 0xffff) throw new RangeError('plumb reads at most 65,535 files into one graph');
    this.files.push(name);
    return this.files.length - 1;
  }

  get size(): number {
    return this.s.length;
  }

  /** The files registered so far, in index order. */
  get fileNames(): readonly string[] {
    return this.files;
  }

  /** Adds a triple of term ids; returns false (and counts a duplicate) when it is already present. */
  add(s: number, p: number, o: number, g: number, file: number, line: number): boolean {
    if (this.s.length * 2 >= this.mask) this.grow();
    const h = hashTriple(s, p, o, g);
    const table = this.table;
    const mask = this.mask;
    let slot = h & mask;
    for (;;) {
      const t = table[2 * slot + 1]!;
      if (t === 0) break;
      if (table[2 * slot] === h) {
        const i = t - 1;
        if (this.s.data[i] === s && this.p.data[i] === p && this.o.data[i] === o && this.g.data[i] === g) {
          this.duplicates++;
          return false;
        }
      }
      slot = (slot + 1) & mask;
    }
    table[2 * slot] = h;
    table[2 * slot + 1] = this.s.length + 1;
    this.s.push(s);
    this.p.push(p);
    this.o.push(o);
    this.g.push(g);
    this.file.push(file);
    this.line.push(line);
    return true;
  }

  /** Adds a triple given as term keys. */
  addKeys(s: string, p: string, o: string, g?: string, file = 0, line = 0): boolean {
    const t = this.terms;
    return this.add(t.intern(s), t.intern(p), t.intern(o), g === undefined ? -1 : t.intern(g), file, line);
  }

  /**
   * Makes room for about `triples` triples in all (an estimate: fewer is harmless, and spare room is
   * dropped by {@link build}), so that a large read does not grow and rehash step by step.
   */
  reserve(triples: number): void {
    const n = Math.min(Math.ceil(triples), 1 << 28);
    for (const column of [this.s, this.p, this.o, this.g, this.file, this.line]) column.reserve(n);
    while (n * 2 >= this.mask) this.grow();
  }

  private grow(): void {
    const old = this.table;
    const capacity = (this.mask + 1) * 2;
    const table = new Int32Array(2 * capacity);
    const mask = capacity - 1;
    for (let k = 1; k < old.length; k += 2) {
      const t = old[k]!;
      if (t === 0) continue;
      const h = old[k - 1]!;
      let slot = h & mask;
      while (table[2 * slot + 1] !== 0) slot = (slot + 1) & mask;
      table[2 * slot] = h;
      table[2 * slot + 1] = t;
    }
    this.table = table;
    this.mask = mask;
  }

  /** Freezes the triples into a graph and builds its indexes. The builder must not be used after. */
  build(): Graph {
    this.table = new Int32Array(0);
    this.mask = 0;
    const n = this.s.length;
    const s = this.s.trimmed(),
      p = this.p.trimmed(),
      o = this.o.trimmed(),
      g = this.g.trimmed();
    const file = this.file.trimmed(),
      line = this.line.trimmed();
    // A builder kept alive by its caller must not keep the growth buffers too.
    for (const column of [this.s, this.p, this.o, this.g, this.file, this.line]) column.release();
    const termCount = this.terms.size;
    return {
      terms: this.terms,
      size: n,
      s,
      p,
      o,
      g,
      provenance: { files: this.files, file, line },
      bySubject: buildCsr(s, termCount),
      byObject: buildCsr(o, termCount),
      byPredicate: buildCsr(p, termCount),
    };
  }
}

/** Counting sort of triple indexes by one column. */
export function buildCsr(column: Int32Array, termCount: number): Csr {
  const offsets = new Int32Array(termCount + 1);
  for (let i = 0; i < column.length; i++) offsets[column[i]! + 1]!++;
  for (let t = 0; t < termCount; t++) offsets[t + 1]! += offsets[t]!;
  const cursor = offsets.slice(0, termCount);
  const triples = new Int32Array(column.length);
  for (let i = 0; i < column.length; i++) triples[cursor[column[i]!]!++] = i;
  return { offsets, triples };
}

/** The triple indexes of one CSR row. */
export function row(csr: Csr, term: number): Int32Array {
  if (term < 0 || term + 1 >= csr.offsets.length) return new Int32Array(0);
  return csr.triples.subarray(csr.offsets[term]!, csr.offsets[term + 1]!);
}

/** Builds a graph from term-key triples; for tests and small programmatic inputs. */
export function graphFromKeys(
  triples: ReadonlyArray<readonly [string, string, string]>,
  file = 'inline',
): Graph {
  const b = new GraphBuilder();
  const f = b.addFile(file);
  triples.forEach(([s, p, o], i) => b.addKeys(s, p, o, undefined, f, i + 1));
  return b.build();
}

/** True when the term can be an entity for the model (an IRI or a blank node, not a literal). */
export function isResource(graph: Graph, term: number): boolean {
  return graph.terms.kind(term) !== TermKind.Literal;
}

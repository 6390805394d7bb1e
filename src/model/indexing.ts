import type { Graph } from '../graph/store.js';
import type { EntityIndex, RelationIndex } from './types.js';

/**
 * The model's view of a graph: triples whose subject and object are both resources (IRIs or blank
 * nodes), as entity and relation indexes. Triples with a literal object are not modelled. The same
 * (s, p, o) in several named graphs is one model triple.
 */
export interface ModelTriples {
  readonly entities: EntityIndex;
  readonly relations: RelationIndex;
  /** Unique (s, r, o) as entity / relation indexes. */
  readonly s: Int32Array;
  readonly r: Int32Array;
  readonly o: Int32Array;
  readonly count: number;
  /** graph triple index → model triple index, -1 for triples the model does not cover. */
  readonly ofTriple: Int32Array;
}

/** Entities and relations in term-id order, so the same files give the same indexes. */
export function indexGraph(graph: Graph): { entities: EntityIndex; relations: RelationIndex } {
  const termCount = graph.terms.size;
  const isEntity = new Uint8Array(termCount);
  const isRelation = new Uint8Array(termCount);
  const literal = literalMask(graph);
  for (let t = 0; t < graph.size; t++) {
    const o = graph.o[t]!;
    if (literal[o]) continue;
    isEntity[graph.s[t]!] = 1;
    isEntity[o] = 1;
    isRelation[graph.p[t]!] = 1;
  }
  const entityOf = new Int32Array(termCount).fill(-1);
  const relationOf = new Int32Array(termCount).fill(-1);
  let entityCount = 0;
  let relationCount = 0;
  for (let t = 0; t < termCount; t++) {
    if (isEntity[t]) entityOf[t] = entityCount++;
    if (isRelation[t]) relationOf[t] = relationCount++;
  }
  const entityTerms = new Int32Array(entityCount);
  const keys: string[] = [];
  for (let t = 0; t < termCount; t++) {
    if (entityOf[t]! >= 0) entityTerms[entityOf[t]!] = t;
    if (relationOf[t]! >= 0) keys.push(graph.terms.key(t));
  }
  return {
    entities: { ofTerm: entityOf, terms: entityTerms, count: entityCount },
    relations: { ofTerm: relationOf, count: relationCount, keys },
  };
}

function literalMask(graph: Graph): Uint8Array {
  const mask = new Uint8Array(graph.terms.size);
  const keys = graph.terms.allKeys();
  for (let t = 0; t < keys.length; t++) if (keys[t]!.charCodeAt(0) === 34 /* " */) mask[t] = 1;
  return mask;
}

/** Maps the graph's triples onto an entity and relation index (which may come from another graph). */
export function modelTriples(graph: Graph, entities: EntityIndex, relations: RelationIndex): ModelTriples {
  const ofTriple = new Int32Array(graph.size).fill(-1);
  const s = new Int32Array(graph.size);
  const r = new Int32Array(graph.size);
  const o = new Int32Array(graph.size);
  const seen = new TripleSet(graph.size);
  let count = 0;
  for (let t = 0; t < graph.size; t++) {
    const es = entities.ofTerm[graph.s[t]!] ?? -1;
    const eo = entities.ofTerm[graph.o[t]!] ?? -1;
    const rr = relations.ofTerm[graph.p[t]!] ?? -1;
    if (es < 0 || eo < 0 || rr < 0) continue;
    const existing = seen.find(es, rr, eo);
    if (existing >= 0) {
      ofTriple[t] = existing;
      continue;
    }
    s[count] = es;
    r[count] = rr;
    o[count] = eo;
    seen.add(es, rr, eo, count);
    ofTriple[t] = count++;
  }
  return { entities, relations, s: s.slice(0, count), r: r.slice(0, count), o: o.slice(0, count), count, ofTriple };
}

/** Open-addressing set of (s, r, o) integer triples with a value each. */
export class TripleSet {
  private readonly slots: Int32Array;
  private readonly keys: Int32Array;
  private readonly values: Int32Array;
  private size = 0;

  constructor(capacity: number) {
    let n = 16;
    while (n < capacity * 2) n *= 2;
    this.slots = new Int32Array(n).fill(-1);
    this.keys = new Int32Array(capacity * 3);
    this.values = new Int32Array(capacity);
  }

  private static hash(s: number, r: number, o: number): number {
    let h = Math.imul(s, 0x9e3779b1) ^ Math.imul(r + 0x7f4a7c15, 0x85ebca6b) ^ Math.imul(o, 0xc2b2ae35);
    h ^= h >>> 15;
    return Math.imul(h, 0x2c1b3c6d) ^ (h >>> 13);
  }

  /** The value stored for (s, r, o), or -1. */
  find(s: number, r: number, o: number): number {
    const mask = this.slots.length - 1;
    for (let slot = TripleSet.hash(s, r, o) & mask; ; slot = (slot + 1) & mask) {
      const i = this.slots[slot]!;
      if (i < 0) return -1;
      if (this.keys[i * 3] === s && this.keys[i * 3 + 1] === r && this.keys[i * 3 + 2] === o) return this.values[i]!;
    }
  }

  has(s: number, r: number, o: number): boolean {
    return this.find(s, r, o) >= 0;
  }

  /** Adds (s, r, o) unless present; at most `capacity` triples. */
  add(s: number, r: number, o: number, value = 0): void {
    const mask = this.slots.length - 1;
    let slot = TripleSet.hash(s, r, o) & mask;
    for (; ; slot = (slot + 1) & mask) {
      const i = this.slots[slot]!;
      if (i < 0) break;
      if (this.keys[i * 3] === s && this.keys[i * 3 + 1] === r && this.keys[i * 3 + 2] === o) return;
    }
    if (this.size * 3 >= this.keys.length) throw new RangeError('TripleSet is full');
    this.keys[this.size * 3] = s;
    this.keys[this.size * 3 + 1] = r;
    this.keys[this.size * 3 + 2] = o;
    this.values[this.size] = value;
    this.slots[slot] = this.size++;
  }
}

/** FNV-1a over strings, as 8 hex digits: for dictionary fingerprints, not for security. */
export function fingerprintStrings(values: Iterable<string>): string {
  let h1 = 0x811c9dc5;
  let h2 = 0x01000193;
  let n = 0;
  for (const v of values) {
    for (let i = 0; i < v.length; i++) {
      const c = v.charCodeAt(i);
      h1 = Math.imul(h1 ^ c, 0x01000193);
      h2 = Math.imul(h2 ^ c, 0x5bd1e995);
    }
    h1 = Math.imul(h1 ^ 10, 0x01000193);
    h2 = Math.imul(h2 ^ 10, 0x5bd1e995);
    n++;
  }
  return `${(h1 >>> 0).toString(16).padStart(8, '0')}${(h2 >>> 0).toString(16).padStart(8, '0')}-${n}`;
}

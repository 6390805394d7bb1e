import { row, type Graph } from '../graph/store.js';
import { TermKind, XSD } from '../graph/terms.js';
import type { Schema } from './index.js';
import { V, isSchemaVocabulary } from './vocab.js';

/**
 * Constraints mined from the data itself, after the statistical approach of Paulheim & Bizer,
 * "Improving the Quality of Linked Data Using Statistical Distributions" (IJSWIS 10(2), 2014):
 * the distribution of each predicate's subject and object types is learned from the graph, and a
 * statement whose types are rare for its predicate is suspect (their SDValidate). plumb states the
 * distribution as rules with a support and a confidence, so that each finding can say *which*
 * regularity it breaks:
 *
 *   type rule (p, position, C): support = n_p, the triples of p whose entity in that position has a
 *   known type (a typed resource, or a literal, whose "type" is its datatype and rdfs:Literal);
 *   confidence = n_{p,C} / n_p, the share of them that have class C. The rule holds when
 *   n_p ≥ minSupport and confidence ≥ minConfidence; a triple whose entity lacks C breaks it.
 *
 *   cardinality rule (p, direction): support = the number of distinct subjects (objects) of p;
 *   confidence = the share of them with exactly one value. A subject (object) with more breaks it.
 *
 * Each type finding also carries SDValidate's score, the mean of n_{p,t} / n_p over the entity's
 * types t (from memory of the paper's definition): near 0 when every type it has is rare for p.
 * Untyped resources carry no evidence and are skipped; classes every resource has (rdfs:Resource,
 * owl:Thing) are ignored; language-tagged literals are left out of cardinality, since a value per
 * language is the usual shape of labels.
 */
export interface MinedOptions {
  /** Typed triples (type rules) or distinct entities (cardinality rules) a predicate needs before a rule is mined. */
  minSupport: number;
  /** Share of them that must follow the rule, in (0, 1]. */
  minConfidence: number;
}

/** Common practice for association rules on noisy data; tune with --min-support / --min-confidence. */
export const DEFAULT_MINED_OPTIONS: MinedOptions = { minSupport: 20, minConfidence: 0.95 };

export type Position = 'subject' | 'object';

/** "Pseudo-class" ids for literals, below the term-space ids: RDFS_LITERAL, then one per datatype. */
const RDFS_LITERAL_ID = -1;

export interface TypeRule {
  predicate: number;
  position: Position;
  /** A term-space class id, or a negative id for rdfs:Literal / a datatype (see {@link TypeProfile.className}). */
  cls: number;
  support: number;
  count: number;
  confidence: number;
}

/** The type distribution of one predicate in one position, and the rules it yields. */
export interface TypeProfile {
  predicate: number;
  position: Position;
  /** n_p: triples whose entity in this position has a known type. */
  support: number;
  /** n_{p,C} per class id. */
  counts: Map<number, number>;
  rules: TypeRule[];
  /** The key of a class id of this profile (handles the literal pseudo-classes). */
  className(cls: number): string;
}

export interface TypeProfiles {
  profiles: Map<string, TypeProfile>;
  /**
   * The signature of an entity for `position`: a type-set index (> 0), a negative datatype id for a
   * literal, or 0 when it carries no type evidence.
   */
  signature(term: number, position: Position): number;
  /** The classes (after closure, pseudo-classes for literals) behind a signature. */
  classesOf(signature: number): readonly number[];
  profile(predicate: number, position: Position): TypeProfile | undefined;
}

function literalDatatype(key: string): string {
  if (key.endsWith('>')) return key.slice(key.lastIndexOf('"^^<') + 4, -1);
  return key.charCodeAt(key.length - 1) === 34 ? 'http://www.w3.org/2001/XMLSchema#string' : V.langString;
}

/** Learns the type distribution of every predicate that has enough typed triples. */
export function mineTypeProfiles(graph: Graph, schema: Schema, options: MinedOptions, skip: (p: number, position: Position) => boolean = () => false): TypeProfiles {
  const keys = graph.terms.allKeys();
  const datatypeIds = new Map<string, number>();
  const datatypeKeys: string[] = [];
  const literalSig = new Int32Array(graph.terms.size);
  const universal = new Set([V.rdfsResource, V.owlThing].map((k) => schema.id(k)));
  const signature = (term: number, position: Position): number => {
    if (position === 'object' && graph.terms.kind(term) === TermKind.Literal) {
      let sig = literalSig[term]!;
      if (sig === 0) {
        const dt = literalDatatype(keys[term]!);
        let id = datatypeIds.get(dt);
        if (id === undefined) {
          id = datatypeKeys.length;
          datatypeIds.set(dt, id);
          datatypeKeys.push(dt);
        }
        sig = literalSig[term] = -(id + 2);
      }
      return sig;
    }
    return schema.typeSetIndex(term);
  };
  const classCache = new Map<number, readonly number[]>();
  const classesOf = (sig: number): readonly number[] => {
    let out = classCache.get(sig);
    if (!out) {
      out = sig < 0 ? [RDFS_LITERAL_ID, sig] : schema.typeSet(sig).closed.filter((c) => !universal.has(c));
      classCache.set(sig, out);
    }
    return out;
  };
  const className = (cls: number): string => (cls === RDFS_LITERAL_ID ? V.rdfsLiteral : cls < 0 ? datatypeKeys[-cls - 2]! : schema.key(cls));

  const profiles = new Map<string, TypeProfile>();
  const typePredicate = schema.typePredicate;
  for (let p = 0; p < graph.terms.size; p++) {
    const triples = row(graph.byPredicate, p);
    if (triples.length < options.minSupport || p === typePredicate || isSchemaVocabulary(keys[p]!)) continue;
    for (const position of ['subject', 'object'] as const) {
      if (skip(p, position)) continue;
      const column = position === 'subject' ? graph.s : graph.o;
      const bySig = new Map<number, number>();
      for (const t of triples) {
        const sig = signature(column[t]!, position);
        if (sig !== 0) bySig.set(sig, (bySig.get(sig) ?? 0) + 1);
      }
      let support = 0;
      const counts = new Map<number, number>();
      for (const [sig, n] of bySig) {
        const classes = classesOf(sig);
        if (classes.length === 0) continue;
        support += n;
        for (const c of classes) counts.set(c, (counts.get(c) ?? 0) + n);
      }
      if (support < options.minSupport) continue;
      const rules: TypeRule[] = [];
      for (const [cls, count] of counts) {
        const confidence = count / support;
        if (confidence >= options.minConfidence && count < support) rules.push({ predicate: p, position, cls, support, count, confidence });
      }
      rules.sort((a, b) => a.confidence - b.confidence || a.cls - b.cls);
      profiles.set(`${p} ${position}`, { predicate: p, position, support, counts, rules, className });
    }
  }
  return {
    profiles,
    signature,
    classesOf,
    profile: (p, position) => profiles.get(`${p} ${position}`),
  };
}

/** SDValidate's score of an entity for a profile: mean share n_{p,t} / n_p over its types t. */
export function typeScore(profile: TypeProfile, classes: readonly number[]): number {
  if (classes.length === 0) return 1;
  let sum = 0;
  for (const c of classes) sum += (profile.counts.get(c) ?? 0) / profile.support;
  return sum / classes.length;
}

export type Direction = 'out' | 'in';

export interface CardinalityRule {
  predicate: number;
  /** `out`: at most one object per subject; `in`: at most one subject per object. */
  direction: Direction;
  /** Distinct subjects (out) or objects (in) of the predicate. */
  support: number;
  /** How many of them have exactly one value. */
  single: number;
  confidence: number;
  /** Entities with more than one value, with their triples in index order. */
  breaches: Map<number, number[]>;
}

/**
 * Literal datatypes whose values many entities share by nature (numbers, dates and times, booleans):
 * two people born on one day do not break an "at most one subject per value" rule the way two
 * people with one passport number do. The `in` direction leaves literals of these datatypes out.
 */
const SHARED_BY_NATURE = new Set(
  [
    'integer', 'decimal', 'double', 'float', 'long', 'int', 'short', 'byte', 'nonNegativeInteger', 'positiveInteger',
    'nonPositiveInteger', 'negativeInteger', 'unsignedLong', 'unsignedInt', 'unsignedShort', 'unsignedByte',
    'date', 'dateTime', 'dateTimeStamp', 'time', 'gYear', 'gYearMonth', 'gMonth', 'gMonthDay', 'gDay',
    'duration', 'dayTimeDuration', 'yearMonthDuration', 'boolean',
  ].map((local) => `"^^<${XSD}${local}>`),
);

/** True for a literal key whose datatype is in {@link SHARED_BY_NATURE}. */
function sharedByNature(key: string): boolean {
  if (key.charCodeAt(0) !== 34) return false;
  const end = key.lastIndexOf('"');
  return SHARED_BY_NATURE.has(key.slice(end));
}

/** Mines "at most one value" rules per predicate and direction, with the entities that break them. */
export function mineCardinality(graph: Graph, schema: Schema, options: MinedOptions, skip: (p: number, direction: Direction) => boolean = () => false): CardinalityRule[] {
  const keys = graph.terms.allKeys();
  const out: CardinalityRule[] = [];
  const isLangLiteral = (term: number): boolean => {
    const k = keys[term]!;
    return k.charCodeAt(0) === 34 && k.charCodeAt(k.length - 1) !== 34 && !k.endsWith('>');
  };
  // The first triple per entity, reused across predicates (reset through `touched`).
  const first = new Int32Array(graph.terms.size).fill(-1);
  const langLiteral = new Int8Array(graph.terms.size); // 0 unknown, 1 yes, 2 no
  const sharedValue = new Int8Array(graph.terms.size); // 0 unknown, 1 yes, 2 no
  for (let p = 0; p < graph.terms.size; p++) {
    const triples = row(graph.byPredicate, p);
    if (triples.length < options.minSupport || p === schema.typePredicate || isSchemaVocabulary(keys[p]!)) continue;
    for (const direction of ['out', 'in'] as const) {
      if (skip(p, direction)) continue;
      const [from, to] = direction === 'out' ? [graph.s, graph.o] : [graph.o, graph.s];
      const touched: number[] = [];
      const more = new Map<number, number[]>();
      for (const t of triples) {
        const o = graph.o[t]!;
        if (langLiteral[o] === 0) langLiteral[o] = isLangLiteral(o) ? 1 : 2;
        if (langLiteral[o] === 1) continue;
        if (direction === 'in') {
          if (sharedValue[o] === 0) sharedValue[o] = sharedByNature(keys[o]!) ? 1 : 2;
          if (sharedValue[o] === 1) continue;
        }
        const e = from[t]!;
        const f = first[e]!;
        if (f < 0) {
          first[e] = t;
          touched.push(e);
        } else if (to[f] !== to[t]) {
          const list = more.get(e);
          if (list) list.push(t);
          else more.set(e, [f, t]);
        }
      }
      for (const e of touched) first[e] = -1;
      const support = touched.length;
      if (support < options.minSupport) continue;
      const single = support - more.size;
      const confidence = single / support;
      if (confidence >= options.minConfidence && more.size > 0) out.push({ predicate: p, direction, support, single, confidence, breaches: more });
    }
  }
  return out;
}

/** Mined findings are notes, and warnings when the rule is near-universal on a large base. */
export function minedSeverity(confidence: number, support: number): 'note' | 'warning' {
  return confidence >= 0.99 && support >= 100 ? 'warning' : 'note';
}

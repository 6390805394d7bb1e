import { row, type Graph } from '../graph/store.js';
import { RDF_TYPE } from '../graph/terms.js';
import type { TrainedModel } from '../model/types.js';

/**
 * What a reviewer needs beside a suspect triple to decide without opening another tool:
 * - the entities the model prefers in the object's place for (s, p, ?) and in the subject's place for
 *   (?, p, o), with their logits, leaving out answers the graph already states (filtered) and the
 *   triple's own term; the triple's filtered rank on each side comes from the same scores;
 * - the subject's and object's `rdf:type`s against the types this predicate's subjects and objects
 *   usually have (triple counts);
 * - the degree (triples in which the term is subject or object) of the subject and of the object.
 * The model passed in must be one that did not see the triple (its fold model).
 */

export interface Candidate {
  term: string;
  score: number;
}

export interface TypeCount {
  type: string;
  /** Triples of the predicate whose subject (or object) has this type. */
  triples: number;
}

export interface Explanation {
  /** The triple's own logit under the model. */
  score: number;
  /** Filtered ranks (1 = best) of the triple's object among candidates for (s, p, ?), and of its subject for (?, p, o). */
  objectRank: number;
  subjectRank: number;
  /** Entities that could be ranked. */
  candidates: number;
  preferredObjects: Candidate[];
  preferredSubjects: Candidate[];
  subjectTypes: string[];
  objectTypes: string[];
  /** The predicate's most frequent subject and object types. */
  usualSubjectTypes: TypeCount[];
  usualObjectTypes: TypeCount[];
  /** Other triples of the predicate whose subject shares a type with this subject (likewise for the object); null when the term has no type. */
  subjectTypeSupport: number | null;
  objectTypeSupport: number | null;
  /** Triples of the predicate in all. */
  predicateTriples: number;
  subjectDegree: number;
  objectDegree: number;
}

export interface ExplainOptions {
  /** Preferred entities listed per side. */
  candidates?: number;
  /** Usual types listed per side. */
  types?: number;
}

/** Degree of a term: triples in which it is the subject or the object. */
export function degree(graph: Graph, term: number): number {
  return row(graph.bySubject, term).length + row(graph.byObject, term).length;
}

/** Builds type lookups once per graph and per predicate. */
export class TypeProfile {
  private readonly typeId: number;
  private readonly perPredicate = new Map<number, { subject: Map<number, number>; object: Map<number, number>; total: number }>();

  constructor(private readonly graph: Graph) {
    this.typeId = graph.terms.id(RDF_TYPE);
  }

  typesOf(term: number): number[] {
    if (this.typeId < 0) return [];
    const out: number[] = [];
    for (const t of row(this.graph.bySubject, term)) if (this.graph.p[t] === this.typeId) out.push(this.graph.o[t]!);
    return out;
  }

  /** Triple counts of subject and object types among the predicate's triples. */
  ofPredicate(p: number): { subject: Map<number, number>; object: Map<number, number>; total: number } {
    let profile = this.perPredicate.get(p);
    if (!profile) {
      const subject = new Map<number, number>();
      const object = new Map<number, number>();
      const triples = row(this.graph.byPredicate, p);
      const cache = new Map<number, number[]>();
      const types = (term: number): number[] => {
        let ts = cache.get(term);
        if (!ts) cache.set(term, (ts = this.typesOf(term)));
        return ts;
      };
      for (const t of triples) {
        for (const ty of types(this.graph.s[t]!)) subject.set(ty, (subject.get(ty) ?? 0) + 1);
        for (const ty of types(this.graph.o[t]!)) object.set(ty, (object.get(ty) ?? 0) + 1);
      }
      profile = { subject, object, total: triples.length };
      this.perPredicate.set(p, profile);
    }
    return profile;
  }

  /** Triples of the predicate whose subject (object) has at least one of `types`; null for no types. */
  support(p: number, types: number[], side: 'subject' | 'object'): number | null {
    if (types.length === 0) return null;
    const wanted = new Set(types);
    const column = side === 'subject' ? this.graph.s : this.graph.o;
    let n = 0;
    for (const t of row(this.graph.byPredicate, p)) {
      if (this.typesOf(column[t]!).some((ty) => wanted.has(ty))) n++;
    }
    return n;
  }
}

function topTypes(counts: Map<number, number>, graph: Graph, n: number): TypeCount[] {
  return [...counts.entries()]
    .sort((a, b) => b[1] - a[1] || a[0] - b[0])
    .slice(0, n)
    .map(([type, triples]) => ({ type: graph.terms.key(type), triples }));
}

/** Known answers (entity indexes) for (s, p, ?) or (?, p, o) in the graph: the filter. */
function knownAnswers(model: TrainedModel, graph: Graph, term: number, p: number, side: 'object' | 'subject'): Set<number> {
  const out = new Set<number>();
  const csr = side === 'object' ? graph.bySubject : graph.byObject;
  const other = side === 'object' ? graph.o : graph.s;
  for (const t of row(csr, term)) {
    if (graph.p[t] !== p) continue;
    const e = model.entities.ofTerm[other[t]!] ?? -1;
    if (e >= 0) out.add(e);
  }
  return out;
}

/** Picks the best `n` entities of one score row outside `skip`, and the filtered rank of `own`. */
function readRow(scores: Float32Array, offset: number, count: number, own: number, skip: Set<number>, n: number): { top: Array<[number, number]>; rank: number } {
  const ownScore = scores[offset + own]!;
  let better = 0;
  const top: Array<[number, number]> = [];
  for (let e = 0; e < count; e++) {
    if (e === own || skip.has(e)) continue;
    const v = scores[offset + e]!;
    if (v > ownScore) better++;
    if (top.length < n || v > top[top.length - 1]![1]) {
      top.push([e, v]);
      top.sort((a, b) => b[1] - a[1]);
      if (top.length > n) top.pop();
    }
  }
  return { top, rank: better + 1 };
}

const QUERY_BATCH = 64;

/** The triple itself always counts towards its own type support: leave it out. */
const others = (n: number | null): number | null => (n === null ? null : n - 1);

/**
 * Explanations for the given graph triples under one model (the model that did not see them).
 * A triple the model cannot place (unknown entity or predicate) gets no model part: NaN ranks and
 * empty candidate lists.
 */
export async function explainTriples(model: TrainedModel, graph: Graph, triples: Int32Array, options: ExplainOptions = {}): Promise<Explanation[]> {
  const nCand = options.candidates ?? 3;
  const nTypes = options.types ?? 3;
  const profile = new TypeProfile(graph);
  const count = model.entities.count;
  const out: Explanation[] = [];
  for (let start = 0; start < triples.length; start += QUERY_BATCH) {
    const part = Array.from(triples.subarray(start, start + QUERY_BATCH));
    const placed = part.filter((t) => (model.entities.ofTerm[graph.s[t]!] ?? -1) >= 0 && (model.entities.ofTerm[graph.o[t]!] ?? -1) >= 0 && (model.relations.ofTerm[graph.p[t]!] ?? -1) >= 0);
    const sIdx = Int32Array.from(placed, (t) => model.entities.ofTerm[graph.s[t]!]!);
    const oIdx = Int32Array.from(placed, (t) => model.entities.ofTerm[graph.o[t]!]!);
    const rIdx = Int32Array.from(placed, (t) => model.relations.ofTerm[graph.p[t]!]!);
    const [objectScores, subjectScores, own] =
      placed.length === 0
        ? [new Float32Array(0), new Float32Array(0), new Float32Array(0)]
        : await Promise.all([model.scoreObjects(sIdx, rIdx), model.scoreSubjects(rIdx, oIdx), model.score(sIdx, rIdx, oIdx)]);
    const at = new Map(placed.map((t, q) => [t, q]));
    for (const t of part) {
      const s = graph.s[t]!, p = graph.p[t]!, o = graph.o[t]!;
      const pp = profile.ofPredicate(p);
      const sTypes = profile.typesOf(s), oTypes = profile.typesOf(o);
      const e: Explanation = {
        score: Number.NaN,
        objectRank: Number.NaN,
        subjectRank: Number.NaN,
        candidates: count,
        preferredObjects: [],
        preferredSubjects: [],
        subjectTypes: sTypes.map((x) => graph.terms.key(x)),
        objectTypes: oTypes.map((x) => graph.terms.key(x)),
        usualSubjectTypes: topTypes(pp.subject, graph, nTypes),
        usualObjectTypes: topTypes(pp.object, graph, nTypes),
        subjectTypeSupport: others(profile.support(p, sTypes, 'subject')),
        objectTypeSupport: others(profile.support(p, oTypes, 'object')),
        predicateTriples: pp.total,
        subjectDegree: degree(graph, s),
        objectDegree: degree(graph, o),
      };
      const q = at.get(t);
      if (q !== undefined) {
        const ob = readRow(objectScores, q * count, count, oIdx[q]!, knownAnswers(model, graph, s, p, 'object'), nCand);
        const sb = readRow(subjectScores, q * count, count, sIdx[q]!, knownAnswers(model, graph, o, p, 'subject'), nCand);
        const key = (ent: number): string => graph.terms.key(model.entities.terms[ent]!);
        e.score = own[q]!;
        e.objectRank = ob.rank;
        e.subjectRank = sb.rank;
        e.preferredObjects = ob.top.map(([ent, score]) => ({ term: key(ent), score }));
        e.preferredSubjects = sb.top.map(([ent, score]) => ({ term: key(ent), score }));
      }
      out.push(e);
    }
  }
  return out;
}

/** A one-line reading of an explanation, for the finding's message. */
export function explanationLine(e: Explanation, shortName: (key: string) => string = (k) => k): string {
  const parts: string[] = [];
  if (!Number.isNaN(e.objectRank)) parts.push(`object ranks ${e.objectRank} of ${e.candidates}, subject ${e.subjectRank}`);
  const alt = e.preferredObjects[0];
  if (alt) parts.push(`the model prefers ${shortName(alt.term)} as object`);
  if (e.objectTypeSupport === 0 && e.objectTypes.length > 0) parts.push(`no other object of this predicate has type ${shortName(e.objectTypes[0]!)}`);
  if (e.subjectTypeSupport === 0 && e.subjectTypes.length > 0) parts.push(`no other subject of this predicate has type ${shortName(e.subjectTypes[0]!)}`);
  parts.push(`degrees ${e.subjectDegree}/${e.objectDegree}`);
  return parts.join('; ');
}

import type { Graph } from '../graph/store.js';
import { KnownTriples, filteredRank } from '../model/known.js';
import type { TrainedModel } from '../model/types.js';
import type { ProgressSink } from '../progress.js';

/**
 * Filtered ranking (Bordes, Usunier, García-Durán, Weston & Yakhnenko, "Translating Embeddings for
 * Modeling Multi-relational Data", NIPS 2013, §4.2 "filtered" setting): for a triple (s, r, o), the
 * rank of o among all entities as object of (s, r, ?) and of s among all entities as subject of
 * (?, r, o), where every *other* known true triple is removed from the candidates first.
 *
 * Ties: rank = 1 + #(candidates scoring higher) + #(candidates scoring equal) / 2, the mean of the
 * optimistic and pessimistic ranks, so equal scores earn no credit. Scores are computed in batches of
 * queries as one matmul each against the entity table transposed once; ranks are counted in plain
 * loops over the returned rows.
 */
export { KnownTriples, filteredRank };

/** A known-triple test over entity / relation indexes, or a prebuilt index. */
export type Known = KnownTriples | ((s: number, r: number, o: number) => boolean);

export interface RankOptions {
  /** Triples to filter out; default: every modelled triple of the graph. */
  known?: Known;
  /** Queries per matmul; default: as many as fit in about 4M scores. */
  batchSize?: number;
  progress?: ProgressSink;
}

export interface Ranks {
  /** Filtered rank of the true object; NaN where the triple is not modelled (literal, unknown term). */
  objectRank: Float64Array;
  /** Filtered rank of the true subject. */
  subjectRank: Float64Array;
  /** The model's logit f(s, r, o); NaN where not modelled. */
  score: Float32Array;
}

/** Entity / relation indexes of the graph's triples under the model's index (-1: not modelled). */
export function tripleIndexes(model: TrainedModel, graph: Graph, triples: Int32Array): { s: Int32Array; r: Int32Array; o: Int32Array } {
  const n = triples.length;
  const s = new Int32Array(n);
  const r = new Int32Array(n);
  const o = new Int32Array(n);
  const { entities, relations } = model;
  for (let i = 0; i < n; i++) {
    const t = triples[i]!;
    s[i] = entities.ofTerm[graph.s[t]!] ?? -1;
    r[i] = relations.ofTerm[graph.p[t]!] ?? -1;
    o[i] = entities.ofTerm[graph.o[t]!] ?? -1;
  }
  return { s, r, o };
}

/** Every modelled triple of `graph` (whose term ids the model's index refers to), as a filter. */
export function knownFromGraph(model: TrainedModel, graph: Graph): KnownTriples {
  const all = new Int32Array(graph.size);
  for (let t = 0; t < graph.size; t++) all[t] = t;
  const { s, r, o } = compact(tripleIndexes(model, graph, all));
  return new KnownTriples(s, r, o, model.entities.count, model.relations.count);
}

/**
 * Entity / relation indexes of triples given as term keys (from another file and dictionary),
 * matched by key to the model's index over `graph`; -1 for an entity or predicate it does not know.
 */
export function indexesOfKeys(model: TrainedModel, graph: Graph, triples: Iterable<readonly [string, string, string]>): { s: Int32Array; r: Int32Array; o: Int32Array } {
  const entityOf = new Map<string, number>();
  for (let e = 0; e < model.entities.count; e++) entityOf.set(graph.terms.key(model.entities.terms[e]!), e);
  const relationOf = new Map(model.relations.keys.map((key, i) => [key, i]));
  const s: number[] = [];
  const r: number[] = [];
  const o: number[] = [];
  for (const [ks, kp, ko] of triples) {
    s.push(entityOf.get(ks) ?? -1);
    r.push(relationOf.get(kp) ?? -1);
    o.push(entityOf.get(ko) ?? -1);
  }
  return { s: Int32Array.from(s), r: Int32Array.from(r), o: Int32Array.from(o) };
}

/** A filter over the model's index from several lists of entity / relation index triples. */
export function knownFrom(model: TrainedModel, ...lists: { s: Int32Array; r: Int32Array; o: Int32Array }[]): KnownTriples {
  const parts = lists.map(compact);
  const n = parts.reduce((sum, p) => sum + p.s.length, 0);
  const s = new Int32Array(n);
  const r = new Int32Array(n);
  const o = new Int32Array(n);
  let at = 0;
  for (const p of parts) {
    s.set(p.s, at);
    r.set(p.r, at);
    o.set(p.o, at);
    at += p.s.length;
  }
  return new KnownTriples(s, r, o, model.entities.count, model.relations.count);
}

function compact(t: { s: Int32Array; r: Int32Array; o: Int32Array }): { s: Int32Array; r: Int32Array; o: Int32Array } {
  const keep: number[] = [];
  for (let i = 0; i < t.s.length; i++) if (t.s[i]! >= 0 && t.r[i]! >= 0 && t.o[i]! >= 0) keep.push(i);
  if (keep.length === t.s.length) return t;
  return { s: Int32Array.from(keep, (i) => t.s[i]!), r: Int32Array.from(keep, (i) => t.r[i]!), o: Int32Array.from(keep, (i) => t.o[i]!) };
}

/** Filtered ranks of graph triples (by triple index) under the model. */
export async function filteredRanks(model: TrainedModel, graph: Graph, triples: Int32Array, options: RankOptions = {}): Promise<Ranks> {
  const known = options.known ?? knownFromGraph(model, graph);
  const { s, r, o } = tripleIndexes(model, graph, triples);
  return rankTriples(model, s, r, o, { ...options, known });
}

/**
 * Filtered ranks of arbitrary (s, r, o) entity / relation index triples (which need not be in any
 * graph); an index of -1 (an entity or predicate the model does not know) gives NaN.
 */
export async function rankTriples(model: TrainedModel, s: Int32Array, r: Int32Array, o: Int32Array, options: RankOptions = {}): Promise<Ranks> {
  const n = s.length;
  const objectRank = new Float64Array(n).fill(NaN);
  const subjectRank = new Float64Array(n).fill(NaN);
  const score = new Float32Array(n).fill(NaN);
  const valid: number[] = [];
  for (let i = 0; i < n; i++) if (s[i]! >= 0 && r[i]! >= 0 && o[i]! >= 0) valid.push(i);
  const known = options.known ?? new KnownTriples(new Int32Array(0), new Int32Array(0), new Int32Array(0), model.entities.count, model.relations.count);
  const entityCount = model.entities.count;
  const chunk = Math.max(1, options.batchSize ?? Math.floor(4_000_000 / Math.max(1, entityCount)));
  for (let start = 0; start < valid.length; start += chunk) {
    const index = valid.slice(start, start + chunk);
    const qs = Int32Array.from(index, (i) => s[i]!);
    const qr = Int32Array.from(index, (i) => r[i]!);
    const qo = Int32Array.from(index, (i) => o[i]!);
    const scores = await model.score(qs, qr, qo);
    const objects = await model.scoreObjects(qs, qr);
    for (let k = 0; k < index.length; k++) {
      const row = objects.subarray(k * entityCount, (k + 1) * entityCount);
      objectRank[index[k]!] = rankIn(row, qo[k]!, known, qs[k]!, qr[k]!, true);
      score[index[k]!] = scores[k]!;
    }
    const subjects = await model.scoreSubjects(qr, qo);
    for (let k = 0; k < index.length; k++) {
      const row = subjects.subarray(k * entityCount, (k + 1) * entityCount);
      subjectRank[index[k]!] = rankIn(row, qs[k]!, known, qo[k]!, qr[k]!, false);
    }
    options.progress?.({ phase: 'rank', done: Math.min(start + chunk, valid.length), total: valid.length });
  }
  return { objectRank, subjectRank, score };
}

/** The filtered rank of `target` in `row`; `anchor` is the other end of the query. */
function rankIn(row: Float32Array, target: number, known: Known, anchor: number, r: number, objects: boolean): number {
  if (known instanceof KnownTriples) {
    return filteredRank(row, target, objects ? known.objects(anchor, r) : known.subjects(r, anchor));
  }
  // A predicate can only be asked about candidates: check those that could change the rank.
  const score = row[target]!;
  if (Number.isNaN(score)) return (row.length + 1) / 2;
  let greater = 0;
  let equal = 0;
  for (let e = 0; e < row.length; e++) {
    const v = row[e]!;
    if (e === target || !(v >= score)) continue;
    if (objects ? known(anchor, r, e) : known(e, r, anchor)) continue;
    if (v > score) greater++;
    else equal++;
  }
  return 1 + greater + equal / 2;
}

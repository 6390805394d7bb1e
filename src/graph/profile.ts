import type { Graph } from './store.js';
import { RDF_TYPE, termKind, TermKind } from './terms.js';

/**
 * The shape of a graph in numbers: what `plumb stats` prints and what checks and the model use to
 * size themselves. One pass over the columns plus a sort of the degrees; no strings per triple.
 *
 * Vocabulary: an *entity* is a term that is not a literal and appears as a subject or an object (IRIs
 * used only as predicates are not entities). Literals stay in the store for the checks but are not
 * entities for the model; {@link entityIds} can include them when asked.
 */
export interface DegreeSummary {
  min: number;
  median: number;
  mean: number;
  /** Nearest-rank percentiles: the smallest degree at or above which 10 % (1 %) of entities lie. */
  p90: number;
  p99: number;
  max: number;
}

export interface PredicateProfile {
  /** The predicate's term key (its IRI). */
  predicate: string;
  id: number;
  triples: number;
  /** Distinct subjects and objects among its triples. */
  subjects: number;
  objects: number;
  /** Triples whose object is a literal. */
  literalObjects: number;
}

export interface GraphProfile {
  /** Unique triples held (duplicates are dropped on reading). */
  triples: number;
  /** Distinct terms in the dictionary (every position, named graphs included). */
  terms: number;
  entities: number;
  /** Entities that are blank nodes. */
  blankNodes: number;
  predicates: number;
  /** Distinct literals in object position. */
  literals: number;
  /** Distinct named graphs (0 when everything is in the default graph). */
  namedGraphs: number;
  /** Degree of an entity: the triples it is the subject or the object of (a self-loop counts twice). */
  degree: DegreeSummary;
  outDegree: DegreeSummary;
  inDegree: DegreeSummary;
  /** Most triples first, then by IRI. */
  perPredicate: PredicateProfile[];
  /**
   * rdf:type coverage: of the entities that are not only classes (a term whose only role is being
   * the object of rdf:type is a class, not something that should itself be typed), how many have at
   * least one rdf:type.
   */
  types: { typed: number; of: number; share: number; classes: number };
}

const EMPTY: DegreeSummary = { min: 0, median: 0, mean: 0, p90: 0, p99: 0, max: 0 };

export function profile(graph: Graph): GraphProfile {
  const termCount = graph.terms.size;
  const kinds = termKinds(graph);
  const { s, p, o, g, size } = graph;

  // Roles of each term: 1 subject, 2 object, 4 predicate, 8 object of rdf:type, 16 object of something else, 32 graph.
  const roles = new Uint8Array(termCount);
  const typeId = graph.terms.id(RDF_TYPE);
  const typed = new Uint8Array(termCount);
  for (let i = 0; i < size; i++) {
    const si = s[i]!,
      pi = p[i]!,
      oi = o[i]!,
      gi = g[i]!;
    roles[si]! |= 1;
    roles[oi]! |= pi === typeId ? 2 | 8 : 2 | 16;
    roles[pi]! |= 4;
    if (gi >= 0) roles[gi]! |= 32;
    if (pi === typeId) typed[si] = 1;
  }

  let entities = 0,
    blankNodes = 0,
    predicates = 0,
    literals = 0,
    namedGraphs = 0;
  let typedEntities = 0,
    typeable = 0,
    classes = 0;
  for (let t = 0; t < termCount; t++) {
    const r = roles[t]!;
    if (r & 4) predicates++;
    if (r & 32) namedGraphs++;
    const kind = kinds[t]!;
    if (kind === TermKind.Literal) {
      if (r & 2) literals++;
      continue;
    }
    if ((r & 3) === 0) continue;
    entities++;
    if (kind === TermKind.Blank) blankNodes++;
    if (r & 8) classes++;
    if ((r & (1 | 16)) === 0) continue; // only ever the object of rdf:type: a class
    typeable++;
    if (typed[t]) typedEntities++;
  }

  const out = new Int32Array(entities);
  const inn = new Int32Array(entities);
  const both = new Int32Array(entities);
  let k = 0;
  for (let t = 0; t < termCount; t++) {
    if (kinds[t] === TermKind.Literal || (roles[t]! & 3) === 0) continue;
    const od = graph.bySubject.offsets[t + 1]! - graph.bySubject.offsets[t]!;
    const id = graph.byObject.offsets[t + 1]! - graph.byObject.offsets[t]!;
    out[k] = od;
    inn[k] = id;
    both[k] = od + id;
    k++;
  }

  return {
    triples: size,
    terms: termCount,
    entities,
    blankNodes,
    predicates,
    literals,
    namedGraphs,
    degree: summarize(both),
    outDegree: summarize(out),
    inDegree: summarize(inn),
    perPredicate: perPredicate(graph, kinds),
    types: {
      typed: typedEntities,
      of: typeable,
      share: typeable === 0 ? 0 : typedEntities / typeable,
      classes,
    },
  };
}

/**
 * The ids of the entities in ascending order: non-literal terms in subject or object position, and
 * literals in object position too when `includeLiterals` is set.
 */
export function entityIds(graph: Graph, options: { includeLiterals?: boolean } = {}): Int32Array {
  const termCount = graph.terms.size;
  const seen = new Uint8Array(termCount);
  for (let i = 0; i < graph.size; i++) {
    seen[graph.s[i]!] = 1;
    seen[graph.o[i]!] = 1;
  }
  const kinds = termKinds(graph);
  let n = 0;
  for (let t = 0; t < termCount; t++) {
    if (seen[t] && (options.includeLiterals || kinds[t] !== TermKind.Literal)) n++;
    else seen[t] = 0;
  }
  const ids = new Int32Array(n);
  let k = 0;
  for (let t = 0; t < termCount; t++) if (seen[t]) ids[k++] = t;
  return ids;
}

function termKinds(graph: Graph): Uint8Array {
  const keys = graph.terms.allKeys();
  const kinds = new Uint8Array(keys.length);
  for (let t = 0; t < keys.length; t++) kinds[t] = termKind(keys[t]!);
  return kinds;
}

/** Summary of a list of degrees; sorts a copy. Percentiles by nearest rank. */
export function summarize(values: Int32Array): DegreeSummary {
  const n = values.length;
  if (n === 0) return { ...EMPTY };
  const sorted = Int32Array.from(values).sort();
  let sum = 0;
  for (let i = 0; i < n; i++) sum += sorted[i]!;
  const rank = (q: number): number => sorted[Math.min(n - 1, Math.max(0, Math.ceil(q * n) - 1))]!;
  const median = n % 2 === 1 ? sorted[(n - 1) >> 1]! : (sorted[n / 2 - 1]! + sorted[n / 2]!) / 2;
  return { min: sorted[0]!, median, mean: sum / n, p90: rank(0.9), p99: rank(0.99), max: sorted[n - 1]! };
}

function perPredicate(graph: Graph, kinds: Uint8Array): PredicateProfile[] {
  const termCount = graph.terms.size;
  // A stamp per term, set to the predicate being counted, counts distinct values in one pass.
  const subjectStamp = new Int32Array(termCount).fill(-1);
  const objectStamp = new Int32Array(termCount).fill(-1);
  const { offsets, triples } = graph.byPredicate;
  const rows: PredicateProfile[] = [];
  for (let pid = 0; pid < termCount; pid++) {
    const from = offsets[pid]!,
      to = offsets[pid + 1]!;
    if (from === to) continue;
    let subjects = 0,
      objects = 0,
      literalObjects = 0;
    for (let k = from; k < to; k++) {
      const i = triples[k]!;
      const si = graph.s[i]!,
        oi = graph.o[i]!;
      if (subjectStamp[si] !== pid) {
        subjectStamp[si] = pid;
        subjects++;
      }
      if (objectStamp[oi] !== pid) {
        objectStamp[oi] = pid;
        objects++;
      }
      if (kinds[oi] === TermKind.Literal) literalObjects++;
    }
    rows.push({
      predicate: graph.terms.key(pid),
      id: pid,
      triples: to - from,
      subjects,
      objects,
      literalObjects,
    });
  }
  rows.sort(
    (a, b) => b.triples - a.triples || (a.predicate < b.predicate ? -1 : a.predicate > b.predicate ? 1 : 0),
  );
  return rows;
}

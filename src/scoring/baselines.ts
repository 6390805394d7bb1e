import { row, type Graph } from '../graph/store.js';
import { Random } from '../model/random.js';

/**
 * Simple rankings to measure the model against. Each returns a *suspicion* per graph triple (higher =
 * ranked earlier as a likely error; NaN = not ranked, placed last by the metrics).
 */

/** A uniformly random order: what any detector must beat. Its AP is about the share of errors. */
export function randomOrder(graph: Graph, seed = 1): Float64Array {
  const random = new Random(seed);
  return Float64Array.from({ length: graph.size }, () => random.next());
}

/**
 * The degree heuristic: a triple between rarely seen terms is suspect. Suspicion is
 * −(ln deg(s) + ln deg(o)), deg counting triples in which the term is subject or object. Uniform noise
 * draws low-degree entities more often than true triples meet them, so this helps only there and only
 * on graphs with skewed degrees (DETECTION-NOTES.md).
 */
export function degreeHeuristic(graph: Graph): Float64Array {
  const deg = new Float64Array(graph.terms.size);
  for (let t = 0; t < deg.length; t++) deg[t] = row(graph.bySubject, t).length + row(graph.byObject, t).length;
  return Float64Array.from({ length: graph.size }, (_, i) => -(Math.log(deg[graph.s[i]!]!) + Math.log(deg[graph.o[i]!]!)));
}

/** Turns plausibility per scored triple into suspicion per graph triple (1 − plausibility; NaN elsewhere). */
export function suspicionFromPlausibility(graph: Graph, triples: Int32Array, plausibility: ArrayLike<number>): Float64Array {
  const out = new Float64Array(graph.size).fill(Number.NaN);
  triples.forEach((t, j) => {
    out[t] = 1 - plausibility[j]!;
  });
  return out;
}

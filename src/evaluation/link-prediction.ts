import type { Graph } from '../graph/store.js';
import type { TrainedModel } from '../model/types.js';
import type { ProgressSink } from '../progress.js';
import { filteredRanks, rankTriples, type Known } from '../scoring/ranking.js';

/**
 * Link-prediction metrics in the filtered setting (Bordes et al. 2013): each test triple is two
 * queries, (s, r, ?) and (?, r, o), and the metrics average over all queries of both directions.
 * - MRR: mean of 1 / rank;
 * - Hits@k: share of queries with rank ≤ k.
 * Ranks are those of `src/scoring/ranking.ts` (ties count half), so a tied first place (rank 1.5)
 * is not a hit at 1.
 */
export interface LinkPredictionMetrics {
  mrr: number;
  hits1: number;
  hits3: number;
  hits10: number;
  /** Rank queries counted: two per ranked test triple. */
  queries: number;
  /** Test triples ranked. */
  triples: number;
  /** Test triples left out because the model does not know their entity or predicate. */
  skipped: number;
}

/** The metrics from ranks; NaN ranks (triples the model cannot rank) are skipped and counted. */
export function linkPredictionMetrics(objectRank: ArrayLike<number>, subjectRank: ArrayLike<number>): LinkPredictionMetrics {
  let reciprocal = 0;
  let hits1 = 0;
  let hits3 = 0;
  let hits10 = 0;
  let queries = 0;
  let triples = 0;
  let skipped = 0;
  for (let i = 0; i < objectRank.length; i++) {
    const a = objectRank[i]!;
    const b = subjectRank[i]!;
    if (Number.isNaN(a) || Number.isNaN(b)) {
      skipped++;
      continue;
    }
    triples++;
    for (const rank of [a, b]) {
      queries++;
      reciprocal += 1 / rank;
      if (rank <= 1) hits1++;
      if (rank <= 3) hits3++;
      if (rank <= 10) hits10++;
    }
  }
  const share = (x: number): number => (queries === 0 ? 0 : x / queries);
  return { mrr: share(reciprocal), hits1: share(hits1), hits3: share(hits3), hits10: share(hits10), queries, triples, skipped };
}

/**
 * Filtered MRR and Hits@1/3/10 of test triples: graph triple indexes of the graph the model's index
 * refers to, or entity / relation index triples (which need not be in it; -1 where unknown).
 */
export async function evaluateLinkPrediction(
  model: TrainedModel,
  graph: Graph,
  testTriples: Int32Array | { s: Int32Array; r: Int32Array; o: Int32Array },
  known?: Known,
  progress?: ProgressSink,
): Promise<LinkPredictionMetrics> {
  const options = { ...(known === undefined ? {} : { known }), ...(progress === undefined ? {} : { progress }) };
  const ranks = testTriples instanceof Int32Array ? await filteredRanks(model, graph, testTriples, options) : await rankTriples(model, testTriples.s, testTriples.r, testTriples.o, options);
  return linkPredictionMetrics(ranks.objectRank, ranks.subjectRank);
}

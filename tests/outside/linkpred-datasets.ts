import { evaluateLinkPrediction, type LinkPredictionMetrics } from '../../src/evaluation/link-prediction.js';
import { fit } from '../../src/model/index.js';
import type { FitOptions } from '../../src/model/types.js';
import { indexesOfKeys, knownFrom } from '../../src/scoring/ranking.js';
import { datasetGraph, readSplit } from '../model/datasets.js';

/**
 * Trains on a dataset's train split with its valid split for early stopping, and measures filtered
 * MRR and Hits@k on its test split (filtered by train + valid + test, both directions), as in
 * Schlichtkrull et al. 2018 §5. The runs are seeded and deterministic on the wasm backend.
 */
export async function trainAndTest(name: string, options: FitOptions): Promise<LinkPredictionMetrics> {
  const { graph, ranges } = datasetGraph(name, ['train', 'valid']);
  const [start, end] = ranges.valid!;
  const valid = Int32Array.from({ length: end - start }, (_, i) => start + i);
  const model = await fit(graph, { backend: 'wasm', seed: 1, valid, ...options });
  try {
    const all = [...readSplit(name, 'train'), ...readSplit(name, 'valid'), ...readSplit(name, 'test')];
    const known = knownFrom(model, indexesOfKeys(model, graph, all));
    return await evaluateLinkPrediction(model, graph, indexesOfKeys(model, graph, readSplit(name, 'test')), known);
  } finally {
    model.dispose();
  }
}

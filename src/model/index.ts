/**
 * The relational model: an R-GCN encoder (Schlichtkrull et al. 2018) with a DistMult decoder, or
 * plain DistMult, trained with negative sampling on TensorFlow.js. This module holds only types and
 * thin entry points; TensorFlow.js loads on the first call, so importing it costs nothing.
 */
import type { Graph } from '../graph/store.js';
import type { BackendName, FitOptions, TrainedModel } from './types.js';

export type { BackendName, EntityIndex, FitOptions, HistoryEntry, ModelConfig, RelationIndex, TrainedModel } from './types.js';
export { DEFAULT_MODEL_CONFIG, resolveConfig } from './config.js';
export { KnownTriples, filteredRank } from './known.js';

/**
 * Starts the best TensorFlow.js backend (idempotent): `tfjs-node` where it resolves, else
 * WebAssembly; the cpu backend for tiny graphs or when asked for. Returns the backend's name.
 */
export async function initBackend(preferred: BackendName | 'auto' = 'auto', numEntitiesHint?: number): Promise<BackendName> {
  const backend = await import('./backend.js');
  return backend.initBackend(preferred, numEntitiesHint);
}

/** Trains a model on the graph; see `train.ts` for the procedure. */
export async function fit(graph: Graph, options: FitOptions = {}): Promise<TrainedModel> {
  const train = await import('./train.js');
  return train.fit(graph, options);
}

export interface LoadModelOptions {
  backend?: BackendName | 'auto';
  /** Triples of the graph (1 = hidden) kept out of message passing when computing embeddings. */
  exclude?: Uint8Array;
}

/**
 * Loads a model saved by `TrainedModel.save`. With a graph: refused (PlumbError `E_MODEL`, saying
 * what differs) when the graph has predicates the model does not know or shares too few entities
 * with it; entities new to the model are built by the encoder from their neighbours (plain
 * DistMult: the mean embedding). Without a graph: the embeddings saved at fit time.
 */
export async function loadModel(dir: string, graph?: Graph, options: LoadModelOptions = {}): Promise<TrainedModel> {
  const checkpoint = await import('./checkpoint.js');
  return checkpoint.loadModel(dir, graph, options);
}

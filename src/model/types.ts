import type { ProgressSink } from '../progress.js';

/** `tensorflow`: the native `@tensorflow/tfjs-node` backend; `wasm`: WebAssembly (SIMD, one core); `cpu`: plain JS. */
export type BackendName = 'tensorflow' | 'wasm' | 'cpu';

/** Everything that shapes a model and its training; saved with every checkpoint. */
export interface ModelConfig {
  /** `rgcn`: entity embeddings come from R-GCN layers over the graph; `none`: a free table (plain DistMult). */
  encoder: 'rgcn' | 'none';
  /** Width of every embedding and hidden layer. */
  dim: number;
  /** R-GCN layers (ignored with `encoder: 'none'`). */
  layers: number;
  /** How W_r is parameterised (Schlichtkrull et al. 2018 §2.2). */
  decomposition: 'none' | 'basis' | 'block';
  /** Basis matrices B for `basis`. */
  bases: number;
  /** Diagonal blocks for `block`; `dim` must be a multiple of it. */
  blocks: number;
  /** Feature dropout on each layer's input, during training only. */
  dropout: number;
  /** Share of the message-passing triples dropped at each training step. */
  edgeDropout: number;
  /** Corrupted triples per positive. */
  negatives: number;
  /** `uniform`: replacements drawn from all entities; `typed`: from entities seen in that position of that predicate. */
  sampling: 'uniform' | 'typed';
  epochs: number;
  /** Positive triples per training step; 0 = automatic (see `train.ts`). */
  batchSize: number;
  learningRate: number;
  /** Weight of the L2 penalty on the decoder's inputs (entity rows and relation vectors of the batch). */
  l2: number;
  /** Stop after this many validations without a better filtered MRR. */
  patience: number;
  seed: number;
}

export interface ProgressOptions {
  progress?: ProgressSink;
}

export interface FitOptions extends Partial<ModelConfig> {
  backend?: BackendName | 'auto';
  /** 1 = hidden: excluded from training AND from message passing (out-of-fold scoring). Length graph.size. */
  exclude?: Uint8Array;
  /** Validation triples for early stopping (graph triple indexes); default: a held-out share of training triples. */
  valid?: Int32Array;
  /** Start from these weights (entities and relations are matched by term key). */
  warmStart?: TrainedModel;
  /** Stop training after this many seconds (the best weights so far are kept). */
  maxSeconds?: number;
  /** Phase `fit`, detail like `epoch 3/40 loss 0.31 mrr 0.52 eta 40s`. */
  progress?: ProgressSink;
}

export interface EntityIndex {
  /** graph term id → entity index, -1 for literals and terms in no resource-to-resource triple. */
  ofTerm: Int32Array;
  /** entity index → graph term id. */
  terms: Int32Array;
  count: number;
}

export interface RelationIndex {
  /** graph term id → relation index, -1 for terms that are not a modelled predicate. */
  ofTerm: Int32Array;
  /** Predicates, without the inverse relation types the encoder adds. */
  count: number;
  /** Term key of each relation, in relation-index order. */
  keys: string[];
}

export interface HistoryEntry {
  epoch: number;
  loss: number;
  validMrr?: number;
  /** Seconds since the fit began. */
  seconds: number;
}

export interface TrainedModel {
  readonly config: ModelConfig;
  readonly backend: BackendName;
  readonly entities: EntityIndex;
  readonly relations: RelationIndex;
  readonly history: HistoryEntry[];
  /** Entities of the graph the model was loaded against that it never saw in training (0 after `fit`). */
  readonly unseenEntities?: number;
  /** When loaded against a graph: 1 for each entity (by index) that the saved model never saw. */
  readonly unseen?: Uint8Array | undefined;
  /** DistMult logits f(s,r,o) for triples given as entity/relation indexes (batched). */
  score(s: Int32Array, r: Int32Array, o: Int32Array): Promise<Float32Array>;
  /** For each query i, logits of every entity as object of (s[i], r[i], ?), row-major [queries × entities]. */
  scoreObjects(s: Int32Array, r: Int32Array): Promise<Float32Array>;
  /** For each query i, logits of every entity as subject of (?, r[i], o[i]), row-major [queries × entities]. */
  scoreSubjects(r: Int32Array, o: Int32Array): Promise<Float32Array>;
  /** Writes weights, configuration and the dictionary fingerprint atomically (temp dir, then rename). */
  save(dir: string): Promise<void>;
  dispose(): void;
}

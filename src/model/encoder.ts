import { tf } from './backend.js';
import { graphTensors, initLayer, layerForward, layerParameterCount, type Formulation, type GraphTensors, type LayerShape, type LayerWeights } from './rgcn.js';
import type { MessageGraph } from './edges.js';
import type { Random } from './random.js';
import type { ModelConfig } from './types.js';

let nextModelId = 0;

/** Variable names are global to a tfjs process: each model's get a distinct prefix. */
export function uniquePrefix(): string {
  return `plumb${nextModelId++}`;
}

/**
 * All trainable weights of a model: the input entity table (the R-GCN's layer-0 features, or
 * plain DistMult's embeddings), the R-GCN layers, and the decoder's relation vectors.
 */
export interface Weights {
  entities: tf.Variable<tf.Rank.R2>;
  layers: LayerWeights[];
  relations: tf.Variable<tf.Rank.R2>;
}

export function layerShapes(config: ModelConfig, relationCount: number): LayerShape[] {
  if (config.encoder === 'none') return [];
  const b = config.decomposition === 'basis' ? config.bases : config.decomposition === 'block' ? config.blocks : 0;
  return Array.from({ length: config.layers }, () => ({
    dIn: config.dim,
    dOut: config.dim,
    types: 2 * relationCount,
    decomposition: config.decomposition,
    b,
  }));
}

export function parameterCount(config: ModelConfig, entityCount: number, relationCount: number): number {
  const layers = layerShapes(config, relationCount).reduce((sum, shape) => sum + layerParameterCount(shape), 0);
  return entityCount * config.dim + layers + relationCount * config.dim;
}

export function initWeights(config: ModelConfig, entityCount: number, relationCount: number, random: Random): Weights {
  const prefix = uniquePrefix();
  // Rows of unit expected squared norm: uniform in ±√(3/d) (common practice for embedding tables).
  const limit = Math.sqrt(3 / config.dim);
  const entities = tf.variable(tf.tensor2d(random.uniform(entityCount * config.dim, limit), [entityCount, config.dim]), true, `${prefix}/entities`);
  const layers = layerShapes(config, relationCount).map((shape, l) => initLayer(shape, random, `${prefix}/layer${l}`));
  const relations = tf.variable(tf.tensor2d(random.uniform(relationCount * config.dim, limit), [relationCount, config.dim]), true, `${prefix}/relations`);
  return { entities, layers, relations };
}

export function weightList(weights: Weights): tf.Variable[] {
  const list: tf.Variable[] = [weights.entities];
  for (const layer of weights.layers) {
    list.push(layer.w0, layer.w);
    if (layer.a) list.push(layer.a);
  }
  list.push(weights.relations);
  return list;
}

export interface EncodeOptions {
  training: boolean;
  dropout?: number;
  /** Seed of this step's dropout masks. */
  seed?: number;
  formulation?: Formulation;
}

/**
 * Entity embeddings for the decoder: the R-GCN stack over `graph`, or the entity table itself.
 * Inference (`training: false`) keeps no tensor for a backward pass.
 */
export function encode(config: ModelConfig, weights: Weights, shapes: LayerShape[], graph: GraphTensors | null, options: EncodeOptions): tf.Tensor2D {
  if (config.encoder === 'none' || graph === null) return weights.entities;
  let h: tf.Tensor2D = weights.entities;
  for (let l = 0; l < shapes.length; l++) {
    const input = options.training && (options.dropout ?? 0) > 0 ? (tf.dropout(h, options.dropout!, undefined, (options.seed ?? 0) + l) as tf.Tensor2D) : h;
    const pre = layerForward(shapes[l]!, weights.layers[l]!, input, graph, options.training, options.formulation);
    h = l < shapes.length - 1 ? tf.relu(pre) : pre;
  }
  return h;
}

/** Final embeddings over a message graph, outside any gradient tape. */
export function embed(config: ModelConfig, weights: Weights, shapes: LayerShape[], graph: MessageGraph | null): tf.Tensor2D {
  if (config.encoder === 'none' || graph === null) return tf.clone(weights.entities);
  const tensors = graphTensors(graph);
  try {
    return tf.tidy(() => encode(config, weights, shapes, tensors, { training: false }));
  } finally {
    tensors.dispose();
  }
}

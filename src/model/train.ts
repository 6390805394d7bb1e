import type { Graph } from '../graph/store.js';
import { PlumbError } from '../errors.js';
import { initBackend, rethrowMemory, tf } from './backend.js';
import { resolveConfig } from './config.js';
import { batchLoss, scoreAll } from './distmult.js';
import { EdgeLayout, type MessageGraph } from './edges.js';
import { embed, encode, initWeights, layerShapes, weightList, type Weights } from './encoder.js';
import { fingerprintStrings, indexGraph, modelTriples, type ModelTriples } from './indexing.js';
import { KnownTriples, filteredRank } from './known.js';
import { Random } from './random.js';
import { graphTensors, type Formulation, type LayerShape } from './rgcn.js';
import { NegativeSampler } from './sampler.js';
import { RelationalModel, type Fingerprint } from './trained.js';
import type { BackendName, FitOptions, HistoryEntry, ModelConfig, TrainedModel } from './types.js';

/** Validation triples ranked for early stopping, at most (a seeded sample when there are more). */
export const VALIDATION_SAMPLE = 1000;
/** Default held-out share of the training triples when no validation triples are given. */
export const HELD_OUT_SHARE = 0.05;
/**
 * Early stopping waits `patience` epochs without a better validation MRR, but only once learning has
 * visibly started (the MRR rose this much above its first value): from small initial weights the
 * MRR can sit at chance level for many steps before it moves. Before that it waits this many times
 * longer, so a graph with nothing to learn still stops.
 */
const LEARNING_STARTED = 0.02;
const STALLED_PATIENCE = 4;
/** Below this many held-out triples, early stopping is too noisy: train for all epochs instead. */
const MIN_HELD_OUT = 20;

/** Internal knobs for benchmarks and tests; not part of the public options. */
export interface FitInternals {
  formulation?: Formulation;
}

/**
 * Trains a model on `graph`: binary cross-entropy with logits over each positive and its sampled
 * negatives, L2 on the decoder's inputs, Adam, mini-batches of triples, early stopping on the
 * filtered MRR of validation triples. For the R-GCN encoder, every step passes messages over the
 * whole training graph *minus the step's own positives* (a triple is never evidence for itself)
 * minus a random `edgeDropout` share of triples. Hidden (`exclude`) triples are never trained on
 * nor passed as messages; validation triples are not trained on and not passed as messages during
 * training, but the final embeddings use them (they are observed triples of the graph).
 */
export async function fit(graph: Graph, options: FitOptions = {}, internals: FitInternals = {}): Promise<TrainedModel> {
  const started = performance.now();
  const config = resolveConfig(options);
  if (options.exclude !== undefined && options.exclude.length !== graph.size) {
    throw new PlumbError('E_USAGE', `exclude has ${options.exclude.length} entries but the graph has ${graph.size} triples`);
  }
  const { entities, relations } = indexGraph(graph);
  const data = modelTriples(graph, entities, relations);
  if (data.count === 0) {
    throw new PlumbError('E_INPUT', 'the graph has no triple between two resources (IRIs or blank nodes): the model has nothing to learn from', {
      hint: 'triples with a literal object are not modelled; run `plumb stats` to see what the graph holds',
    });
  }
  const backend = await initBackend(options.backend ?? 'auto', entities.count);
  const random = new Random(config.seed);

  const hidden = new Uint8Array(data.count);
  if (options.exclude) {
    for (let t = 0; t < graph.size; t++) if (options.exclude[t] && data.ofTriple[t]! >= 0) hidden[data.ofTriple[t]!] = 1;
  }
  const isValid = chooseValidation(data, hidden, options.valid, random);
  const train: number[] = [];
  const valid: number[] = [];
  for (let t = 0; t < data.count; t++) {
    if (hidden[t]) continue;
    if (isValid[t]) valid.push(t);
    else train.push(t);
  }
  if (train.length === 0) {
    throw new PlumbError('E_INPUT', 'no triple is left to train on once hidden and validation triples are set aside', {
      hint: 'hide fewer triples, or pass fewer validation triples',
    });
  }
  const trainIndex = Int32Array.from(train);
  const validSample = Int32Array.from(valid.length > VALIDATION_SAMPLE ? random.shuffle(valid).slice(0, VALIDATION_SAMPLE).sort((a, b) => a - b) : valid);

  const known = new KnownTriples(data.s, data.r, data.o, entities.count, relations.count);
  const layout = config.encoder === 'rgcn' ? new EdgeLayout(data.s, data.r, data.o, entities.count, relations.count) : null;
  const trainKeep = new Uint8Array(data.count);
  for (const t of train) trainKeep[t] = 1;
  const shapes = layerShapes(config, relations.count);
  const entityKeys = Array.from(entities.terms, (t) => graph.terms.key(t));

  let weights: Weights | undefined;
  let trainGraph: ReturnType<typeof graphTensors> | undefined;
  let optimizer: tf.Optimizer | undefined;
  try {
    weights = initWeights(config, entities.count, relations.count, random);
    if (options.warmStart) warmStart(weights, options.warmStart, config, entityKeys, relations.keys);
    const variables = weightList(weights);
    const sampler = new NegativeSampler(entities.count, config.sampling, pick(data.s, trainIndex), pick(data.r, trainIndex), pick(data.o, trainIndex), relations.count);
    trainGraph = layout ? graphTensors(layout.build(trainKeep)) : undefined;
    optimizer = tf.train.adam(config.learningRate);
    const history: HistoryEntry[] = [];
    const batchSize = config.batchSize > 0 ? Math.min(config.batchSize, trainIndex.length) : autoBatchSize(trainIndex.length);
    const stepsPerEpoch = Math.ceil(trainIndex.length / batchSize);
    let best = -Infinity;
    let bestEpoch = 0;
    let first: number | undefined;
    let snapshot: Float32Array[] | undefined;
    const deadline = options.maxSeconds === undefined ? Infinity : started + options.maxSeconds * 1000;
    const order = trainIndex.slice();
    const keep = new Uint8Array(data.count);
    let stop = false;

    for (let epoch = 1; epoch <= config.epochs && !stop; epoch++) {
      random.shuffle(order);
      let lossSum = 0;
      let seen = 0;
      for (let step = 0; step < stepsPerEpoch; step++) {
        if (performance.now() > deadline && (epoch > 1 || step > 0)) {
          stop = true;
          break;
        }
        const index = order.subarray(step * batchSize, Math.min((step + 1) * batchSize, order.length));
        const batch = sampler.batch(data.s, data.r, data.o, index, config.negatives, random);
        let stepGraph: ReturnType<typeof graphTensors> | undefined;
        if (layout) stepGraph = graphTensors(layout.build(stepEdges(keep, trainKeep, trainIndex, index, config.edgeDropout, random)));
        const seed = random.seed();
        const cost = optimizer.minimize(
          () => {
            const h = encode(config, weights!, shapes, stepGraph ?? null, { training: true, dropout: config.dropout, seed, ...formulationOf(internals) });
            return batchLoss(h, weights!.relations, batch, config.l2);
          },
          true,
          variables,
        );
        stepGraph?.dispose();
        lossSum += cost!.dataSync()[0]! * index.length;
        seen += index.length;
        cost!.dispose();
      }
      if (seen === 0) break;
      const entry: HistoryEntry = { epoch, loss: lossSum / seen, seconds: (performance.now() - started) / 1000 };
      if (validSample.length > 0) {
        entry.validMrr = validationMrr(config, weights, shapes, trainGraph, known, data, validSample);
        first ??= entry.validMrr;
        if (entry.validMrr > best) {
          best = entry.validMrr;
          bestEpoch = epoch;
          snapshot = variables.map((v) => v.dataSync().slice() as Float32Array);
        } else if (epoch - bestEpoch >= (best > first + LEARNING_STARTED ? config.patience : STALLED_PATIENCE * config.patience)) {
          stop = true;
        }
      }
      history.push(entry);
      const perEpoch = entry.seconds / epoch;
      const eta = Math.max(0, Math.min((config.epochs - epoch) * perEpoch, (deadline - performance.now()) / 1000));
      options.progress?.({
        phase: 'fit',
        done: epoch,
        total: config.epochs,
        detail: `epoch ${epoch}/${config.epochs} loss ${entry.loss.toFixed(4)}${entry.validMrr === undefined ? '' : ` mrr ${entry.validMrr.toFixed(3)}`} eta ${Math.round(eta)}s`,
      });
    }
    if (snapshot) variables.forEach((v, i) => v.assign(tf.tensor(snapshot![i]!, v.shape)));
    fillUntrained(weights, trainIndex, data);
    const inference = layout ? layout.build(invert(hidden)) : null;
    const embeddings = embed(config, weights, shapes, inference);
    const fingerprint: Fingerprint = {
      entities: fingerprintStrings(entityKeys),
      relations: fingerprintStrings(relations.keys),
      edges: edgeFingerprint(data, invert(hidden)),
    };
    return new RelationalModel(config, backend as BackendName, entities, relations, history, weights, embeddings, fingerprint, entityKeys);
  } catch (error) {
    if (weights) for (const v of weightList(weights)) v.dispose();
    return rethrowMemory(error, `training (dim ${config.dim}, ${config.encoder === 'rgcn' ? `${config.layers} layer(s), ` : ''}batch ${config.batchSize}, ${entities.count} entities, ${data.count} triples)`);
  } finally {
    trainGraph?.dispose();
    optimizer?.dispose();
  }
}

/**
 * The automatic batch: an eighth of the training triples, so an epoch is about eight steps, within
 * [128, 32768]. For R-GCN every step encodes the whole graph, so big batches amortise the encoder;
 * a small graph still gets several updates per epoch, which early stopping counts in.
 */
export function autoBatchSize(trainTriples: number): number {
  return Math.min(trainTriples, Math.max(128, Math.min(32_768, Math.ceil(trainTriples / 8))));
}

const formulationOf = (internals: FitInternals): { formulation?: Formulation } =>
  internals.formulation === undefined ? {} : { formulation: internals.formulation };

function pick(column: Int32Array, index: Int32Array): Int32Array {
  const out = new Int32Array(index.length);
  for (let i = 0; i < index.length; i++) out[i] = column[index[i]!]!;
  return out;
}

function invert(mask: Uint8Array): Uint8Array {
  const out = new Uint8Array(mask.length);
  for (let i = 0; i < mask.length; i++) out[i] = mask[i] ? 0 : 1;
  return out;
}

/** This step's message triples: the training triples minus the batch's positives minus dropped ones. */
function stepEdges(keep: Uint8Array, trainKeep: Uint8Array, trainIndex: Int32Array, batch: Int32Array, edgeDropout: number, random: Random): Uint8Array {
  keep.set(trainKeep);
  for (let i = 0; i < batch.length; i++) keep[batch[i]!] = 0;
  if (edgeDropout > 0) for (let i = 0; i < trainIndex.length; i++) if (random.next() < edgeDropout) keep[trainIndex[i]!] = 0;
  return keep;
}

/** Marks validation triples: the given ones, or a seeded held-out share of the visible triples. */
function chooseValidation(data: ModelTriples, hidden: Uint8Array, given: Int32Array | undefined, random: Random): Uint8Array {
  const isValid = new Uint8Array(data.count);
  if (given !== undefined) {
    for (const t of given) {
      if (t < 0 || t >= data.ofTriple.length) throw new PlumbError('E_USAGE', `validation triple index ${t} is outside the graph (0..${data.ofTriple.length - 1})`);
      const m = data.ofTriple[t]!;
      if (m >= 0 && !hidden[m]) isValid[m] = 1;
    }
    return isValid;
  }
  const visible: number[] = [];
  for (let t = 0; t < data.count; t++) if (!hidden[t]) visible.push(t);
  const n = Math.min(VALIDATION_SAMPLE, Math.round(visible.length * HELD_OUT_SHARE));
  if (n < MIN_HELD_OUT) return isValid;
  random.shuffle(visible);
  for (let i = 0; i < n; i++) isValid[visible[i]!] = 1;
  return isValid;
}

/** Filtered MRR over both directions of the validation triples, with the training message graph. */
function validationMrr(
  config: ModelConfig,
  weights: Weights,
  shapes: LayerShape[],
  trainGraph: ReturnType<typeof graphTensors> | undefined,
  known: KnownTriples,
  data: ModelTriples,
  sample: Int32Array,
): number {
  const h = trainGraph ? tf.tidy(() => encode(config, weights, shapes, trainGraph, { training: false })) : weights.entities;
  const hT = tf.transpose(h);
  const n = data.entities.count;
  const chunk = Math.max(1, Math.floor(4_000_000 / n));
  let sum = 0;
  try {
    for (let start = 0; start < sample.length; start += chunk) {
      const index = sample.subarray(start, Math.min(start + chunk, sample.length));
      const s = pick(data.s, index);
      const r = pick(data.r, index);
      const o = pick(data.o, index);
      const objects = scoreAll(h, hT, weights.relations, s, r);
      const subjects = scoreAll(h, hT, weights.relations, o, r);
      for (let i = 0; i < index.length; i++) {
        sum += 1 / filteredRank(objects.subarray(i * n, (i + 1) * n), o[i]!, known.objects(s[i]!, r[i]!));
        sum += 1 / filteredRank(subjects.subarray(i * n, (i + 1) * n), s[i]!, known.subjects(r[i]!, o[i]!));
      }
    }
  } finally {
    hT.dispose();
    if (h !== weights.entities) h.dispose();
  }
  return sum / (2 * sample.length);
}

/**
 * Entities in no training triple never received a gradient: start them from the mean input row, so
 * the encoder builds them from their neighbours and plain DistMult gives them a neutral embedding.
 */
function fillUntrained(weights: Weights, trainIndex: Int32Array, data: ModelTriples): void {
  const trained = new Uint8Array(data.entities.count);
  for (let i = 0; i < trainIndex.length; i++) {
    trained[data.s[trainIndex[i]!]!] = 1;
    trained[data.o[trainIndex[i]!]!] = 1;
  }
  let untrained = 0;
  for (let e = 0; e < trained.length; e++) untrained += trained[e] ? 0 : 1;
  if (untrained === 0) return;
  const values = weights.entities.dataSync().slice() as Float32Array;
  const d = weights.entities.shape[1];
  const mean = new Float64Array(d);
  const count = trained.length - untrained;
  for (let e = 0; e < trained.length; e++) if (trained[e]) for (let k = 0; k < d; k++) mean[k]! += values[e * d + k]! / count;
  for (let e = 0; e < trained.length; e++) if (!trained[e]) for (let k = 0; k < d; k++) values[e * d + k] = mean[k]!;
  weights.entities.assign(tf.tensor2d(values, weights.entities.shape));
}

/** An order-independent hash of the message-passing triples (entity / relation indexes). */
export function edgeFingerprint(data: { s: Int32Array; r: Int32Array; o: Int32Array; count: number }, keep: Uint8Array | null): string {
  let a = 0;
  let b = 0;
  let n = 0;
  for (let t = 0; t < data.count; t++) {
    if (keep && !keep[t]) continue;
    let h = Math.imul(data.s[t]! + 1, 0x9e3779b1) ^ Math.imul(data.r[t]! + 7, 0x85ebca6b) ^ Math.imul(data.o[t]! + 13, 0xc2b2ae35);
    h = Math.imul(h ^ (h >>> 15), 0x2c1b3c6d);
    h ^= h >>> 13;
    a = (a + h) | 0;
    b = (b + Math.imul(h, 0x27d4eb2f)) ^ (h >>> 7);
    n++;
  }
  return `${(a >>> 0).toString(16).padStart(8, '0')}${(b >>> 0).toString(16).padStart(8, '0')}-${n}`;
}

/** Copies the weights of `from` into `weights`, matching entities and relations by term key. */
function warmStart(weights: Weights, from: TrainedModel, config: ModelConfig, entityKeys: readonly string[], relationKeys: readonly string[]): void {
  if (!(from instanceof RelationalModel)) throw new PlumbError('E_USAGE', 'warmStart needs a model returned by fit() or loadModel()');
  const a = from.config;
  if (a.encoder !== config.encoder || a.dim !== config.dim || (config.encoder === 'rgcn' && (a.layers !== config.layers || a.decomposition !== config.decomposition || a.bases !== config.bases || a.blocks !== config.blocks))) {
    throw new PlumbError('E_CONFIG', 'warm start needs the same encoder, dim, layers and decomposition as the model it starts from');
  }
  const d = config.dim;
  const fromEntity = new Map<string, number>();
  from.entityKeys.forEach((key, i) => fromEntity.set(key, i));
  const fromRelation = new Map<string, number>();
  from.relations.keys.forEach((key, i) => fromRelation.set(key, i));
  const entityMap = entityKeys.map((key) => fromEntity.get(key) ?? -1);
  const relationMap = relationKeys.map((key) => fromRelation.get(key) ?? -1);
  copyRows(weights.entities, from.weights.entities, entityMap, d);
  copyRows(weights.relations, from.weights.relations, relationMap, d);
  const R = relationKeys.length;
  const fromR = from.relations.count;
  // Relation types: r forwards, r + R inverse.
  const typeMap = [...relationMap, ...relationMap.map((m) => (m < 0 ? -1 : m + fromR))];
  weights.layers.forEach((layer, l) => {
    const source = from.weights.layers[l]!;
    layer.w0.assign(source.w0);
    if (config.decomposition === 'basis') {
      layer.w.assign(source.w);
      copyRows(layer.a!, source.a!, typeMap, config.bases);
    } else {
      const width = layer.w.size / (2 * R);
      copyRows(layer.w, source.w, typeMap, width);
    }
  });
}

/** target[i] = source[map[i]] for rows of `width` values where map[i] ≥ 0. */
function copyRows(target: tf.Variable, source: tf.Tensor, map: readonly number[], width: number): void {
  const into = target.dataSync().slice() as Float32Array;
  const from = source.dataSync() as Float32Array;
  map.forEach((m, i) => {
    if (m >= 0) into.set(from.subarray(m * width, (m + 1) * width), i * width);
  });
  target.assign(tf.tensor(into, target.shape));
}

export type { MessageGraph };

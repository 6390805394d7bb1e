import type { Graph } from '../graph/store.js';
import { TermKind, termKind } from '../graph/terms.js';
import { Random } from '../model/random.js';
import type { BackendName, FitOptions, ModelConfig, TrainedModel } from '../model/types.js';
import type { ProgressSink } from '../progress.js';
import type { OutOfFoldScores } from './plausibility.js';
import { FoldWorker, type PlainFitOptions } from './fold-worker.js';

/**
 * Out-of-fold scoring: a model that has trained on a triple, or passed messages along it, vouches for
 * it (DETECTION-NOTES.md: in-sample DistMult memorised injected errors within a few epochs). So the
 * scored triples are split into k folds; for each fold a model is fitted with that fold's triples
 * hidden from training *and* from message passing (`FitOptions.exclude`), and only that model scores
 * them. Every triple's figure comes from a model that never saw it.
 *
 * Warm starts: a fold model may start from weights that never saw the fold. `half` fits two models,
 * each with one half of the folds hidden, and starts each fold's model from the one that hid it
 * (Measured in tests/scoring/crossfit.test.ts: starting from a model fitted on *everything* lets the
 * fold's triples leak back in — a planted error scores better than cold — so that is not offered.)
 */

export type FitFunction = (graph: Graph, options?: FitOptions) => Promise<TrainedModel>;
export type RankFunction = (
  model: TrainedModel,
  graph: Graph,
  triples: Int32Array,
) => Promise<{ objectRank: Float64Array; subjectRank: Float64Array; score: Float32Array }>;

export type WarmStart = 'none' | 'half';

/**
 * Settings fold models take unless given: early stopping with the model's default patience stopped
 * fold models in the noisy first epochs (validation MRR flat near 0.03 for ~6 epochs on UMLS), which
 * left them untrained (AP 0.04 on 5% random errors, against 0.64 when trained on); the weights of the
 * best validation epoch are kept anyway, so a longer patience costs only time.
 */
export const FOLD_MODEL_DEFAULTS: Partial<ModelConfig> = { patience: 20 };

/** Above this many scorable triples a graph is "large" for fold models (see {@link foldModelDefaults}). */
export const LARGE_GRAPH = 50_000;

/**
 * Fold-model settings by graph size. On large graphs an R-GCN step encodes the whole graph (about 10 s
 * per step on the 235k-triple WordNet graph on this 2-core machine, 8 steps an epoch), so fold models
 * get few epochs within a time budget; a learning rate of 0.05 reached a validation MRR of 0.107 after
 * 3 epochs there, where 0.01 (the model's default) reached 0.013.
 */
export function foldModelDefaults(graph: Graph): Partial<ModelConfig> {
  const scorable = scorableTriples(graph);
  let n = 0;
  for (let i = 0; i < graph.size; i++) if (scorable[i]) n++;
  return n > LARGE_GRAPH ? { ...FOLD_MODEL_DEFAULTS, learningRate: 0.05 } : { ...FOLD_MODEL_DEFAULTS };
}

export interface CrossFitOptions {
  /** Number of folds k (at least 2; default 3). */
  folds?: number;
  seed?: number;
  /** Model settings for every fold model. */
  model?: Partial<ModelConfig>;
  backend?: BackendName | 'auto';
  warmStart?: WarmStart;
  /** Share of the per-fold epochs a warm-started fold model trains for. */
  warmEpochShare?: number;
  /** Also compute filtered subject and object ranks (needed for the `rank` and `combined` bases). */
  ranks?: boolean;
  /** Triples to score (1 = score); the others stay in every fold's training as context. Default: all scorable. */
  only?: Uint8Array;
  /** Wall-clock budget in seconds for all the fits together, shared among the rounds of fits; 0 or absent: none. */
  maxSeconds?: number;
  progress?: ProgressSink;
  /** The training function: `fit` from `src/model/` (injectable for tests). */
  fit: FitFunction;
  /** The ranking function: `filteredRanks` from `src/scoring/ranking.ts`; required with `ranks`. */
  rank?: RankFunction;
  /**
   * Receives each fold model after it scored its fold, and then owns it (must dispose it), e.g. to
   * explain suspects with the model that did not see them. Without it, fold models are disposed.
   */
  keep?: (fold: number, model: TrainedModel) => void;
  /**
   * Worker threads to fit folds in, each with its own TensorFlow.js (one core each); 0 (default) fits
   * them here with `fit`. Workers always use plumb's own `fit` and `filteredRanks`, and only run
   * without warm starts.
   */
  workers?: number;
}

export interface CrossFitResult extends OutOfFoldScores {
  /** The fold (0-based) each scored triple was held out in. */
  fold: Uint8Array;
  folds: number;
  backend: BackendName;
  /** Seconds spent fitting and scoring, all folds together. */
  seconds: { fit: number; score: number };
  /** Epochs each fold model trained (from its history), by fold. */
  epochs: number[];
  config: ModelConfig | undefined;
  /**
   * The worker threads that fitted the folds; with `keep`, the caller stops them (`stop()`) once the
   * models it kept are no longer needed. Empty when the folds ran in this thread.
   */
  workers: FoldWorker[];
}

interface FoldOutcome {
  model: TrainedModel;
  logits: Float32Array;
  ranks: { subjectRank: Float64Array; objectRank: Float64Array } | undefined;
}

/** Triples whose subject and object are resources (IRIs or blank nodes): the ones a model can score. */
export function scorableTriples(graph: Graph): Uint8Array {
  const out = new Uint8Array(graph.size);
  const keys = graph.terms.allKeys();
  const isResource = new Uint8Array(keys.length);
  for (let t = 0; t < keys.length; t++) isResource[t] = termKind(keys[t]!) === TermKind.Literal ? 0 : 1;
  for (let i = 0; i < graph.size; i++) out[i] = isResource[graph.s[i]!]! & isResource[graph.o[i]!]!;
  return out;
}

/** Entities a model of the graph ranks among: resources in some scorable triple. */
export function entityCount(graph: Graph, scorable: Uint8Array = scorableTriples(graph)): number {
  const seen = new Uint8Array(graph.terms.size);
  let n = 0;
  for (let i = 0; i < graph.size; i++) {
    if (!scorable[i]) continue;
    for (const t of [graph.s[i]!, graph.o[i]!]) {
      if (!seen[t]) {
        seen[t] = 1;
        n++;
      }
    }
  }
  return n;
}

/** Assigns each selected triple to one of k folds of near-equal size, at random; -1 for the others. */
export function assignFolds(selected: Uint8Array, k: number, seed: number): Int8Array {
  const idx: number[] = [];
  for (let i = 0; i < selected.length; i++) if (selected[i]) idx.push(i);
  const order = new Random(seed).shuffle(Int32Array.from(idx));
  const fold = new Int8Array(selected.length).fill(-1);
  order.forEach((t, j) => {
    fold[t] = j % k;
  });
  return fold;
}

const BATCH = 65_536;

/** Logits of the given graph triples under one model; NaN where the model has no index for a term. */
export async function scoreTriples(model: TrainedModel, graph: Graph, triples: Int32Array): Promise<Float32Array> {
  const out = new Float32Array(triples.length).fill(Number.NaN);
  const eOf = model.entities.ofTerm, rOf = model.relations.ofTerm;
  for (let start = 0; start < triples.length; start += BATCH) {
    const part = triples.subarray(start, start + BATCH);
    const keep: number[] = [];
    for (let j = 0; j < part.length; j++) {
      const t = part[j]!;
      if ((eOf[graph.s[t]!] ?? -1) >= 0 && (eOf[graph.o[t]!] ?? -1) >= 0 && (rOf[graph.p[t]!] ?? -1) >= 0) keep.push(j);
    }
    if (keep.length === 0) continue;
    const s = Int32Array.from(keep, (j) => eOf[graph.s[part[j]!]!]!);
    const r = Int32Array.from(keep, (j) => rOf[graph.p[part[j]!]!]!);
    const o = Int32Array.from(keep, (j) => eOf[graph.o[part[j]!]!]!);
    const logits = await model.score(s, r, o);
    keep.forEach((j, m) => {
      out[start + j] = logits[m]!;
    });
  }
  return out;
}

/**
 * Scores every selected triple out-of-fold. The result lists the scored triples in graph order; a
 * triple the fold model could not place (a predicate it does not model) keeps a NaN logit.
 */
export async function crossFit(graph: Graph, options: CrossFitOptions): Promise<CrossFitResult> {
  const k = options.folds ?? 3;
  if (!Number.isInteger(k) || k < 2 || k > 100) throw new RangeError(`folds must be an integer from 2 to 100, not ${k}`);
  if (options.ranks && !options.rank) throw new Error('crossFit: ranks requested without a rank function');
  const seed = options.seed ?? options.model?.seed ?? 1;
  const progress = options.progress ?? (() => {});
  const scorable = scorableTriples(graph);
  const selected = options.only ? scorable.map((v, i) => v & (options.only![i] ? 1 : 0)) : scorable;
  const foldOf = assignFolds(selected, k, seed);

  const triples: number[] = [];
  for (let i = 0; i < graph.size; i++) if (foldOf[i]! >= 0) triples.push(i);
  const scored = Int32Array.from(triples);
  const position = new Int32Array(graph.size).fill(-1);
  scored.forEach((t, j) => {
    position[t] = j;
  });
  const logit = new Float32Array(scored.length).fill(Number.NaN);
  const subjectRank = options.ranks ? new Float64Array(scored.length).fill(Number.NaN) : undefined;
  const objectRank = options.ranks ? new Float64Array(scored.length).fill(Number.NaN) : undefined;
  const fold = Uint8Array.from(scored, (t) => foldOf[t]!);

  const warm = options.warmStart ?? 'none';
  const fitsPlanned = k + (warm === 'half' ? 2 : 0);
  const wanted = warm === 'none' ? Math.min(options.workers ?? 0, k) : 0;
  // Fits run in rounds of `wanted` side by side: each gets its share of the wall-clock budget.
  const rounds = wanted > 0 ? Math.ceil(k / wanted) : fitsPlanned;
  const perFitSeconds = options.maxSeconds === undefined || options.maxSeconds <= 0 ? undefined : options.maxSeconds / rounds;
  const base: FitOptions = { ...foldModelDefaults(graph), ...options.model };
  if (options.backend !== undefined) base.backend = options.backend;
  if (perFitSeconds !== undefined) base.maxSeconds = perFitSeconds;

  let fitSeconds = 0, scoreSeconds = 0;
  const epochs: number[] = [];
  let backend: BackendName = 'cpu';
  let config: ModelConfig | undefined;
  let fitsDone = 0;
  let candidates = 0;
  const timedFit = async (exclude: Uint8Array, extra: FitOptions, label: string): Promise<TrainedModel> => {
    const started = performance.now();
    const model = await options.fit(graph, {
      ...base,
      ...extra,
      exclude,
      progress: (e) => progress({ ...e, phase: 'fit', detail: `${label}${e.detail ? ` ${e.detail}` : ''}` }),
    });
    fitSeconds += (performance.now() - started) / 1000;
    fitsDone++;
    progress({ phase: 'folds', done: fitsDone, total: fitsPlanned, detail: label });
    backend = model.backend;
    config = model.config;
    candidates = model.entities.count;
    return model;
  };

  // Halves for warm starting: folds [0, k/2) form half 0, the rest half 1.
  const halfModels: Array<TrainedModel | undefined> = [undefined, undefined];
  if (warm === 'half') {
    for (const h of [0, 1]) {
      const exclude = new Uint8Array(graph.size);
      for (let i = 0; i < graph.size; i++) if (foldOf[i]! >= 0 && (foldOf[i]! < k / 2 ? 0 : 1) === h) exclude[i] = 1;
      halfModels[h] = await timedFit(exclude, { seed: seed + 1000 + h }, `half ${h + 1}/2`);
    }
  }

  // A fold runs either here (the injected fit) or in a worker thread (plumb's own fit, one core each).
  const runHere = async (f: number, exclude: Uint8Array, foldTriples: Int32Array): Promise<FoldOutcome> => {
    const extra: FitOptions = { seed: seed + f };
    const start = halfModels[f < k / 2 ? 0 : 1];
    if (start) {
      extra.warmStart = start;
      const full = options.model?.epochs ?? start.config.epochs;
      extra.epochs = Math.max(1, Math.round(full * (options.warmEpochShare ?? 0.3)));
    }
    const model = await timedFit(exclude, extra, `fold ${f + 1}/${k}`);
    try {
      const started = performance.now();
      const logits = await scoreTriples(model, graph, foldTriples);
      const ranks = options.ranks && options.rank ? await options.rank(model, graph, foldTriples) : undefined;
      scoreSeconds += (performance.now() - started) / 1000;
      return { model, logits, ranks };
    } catch (error) {
      model.dispose();
      throw error;
    }
  };
  const runThere = (worker: FoldWorker) => async (f: number, exclude: Uint8Array, foldTriples: Int32Array): Promise<FoldOutcome> => {
    const label = `fold ${f + 1}/${k}`;
    worker.progress = (e) => progress({ ...e, phase: 'fit', detail: `${label}${e.detail ? ` ${e.detail}` : ''}` });
    const started = performance.now();
    const plain: PlainFitOptions = { ...base, seed: seed + f, exclude };
    const { model, reply } = await worker.fit(graph, plain, foldTriples, options.ranks === true);
    fitSeconds += (performance.now() - started) / 1000 - reply.scoreSeconds;
    scoreSeconds += reply.scoreSeconds;
    fitsDone++;
    progress({ phase: 'folds', done: fitsDone, total: fitsPlanned, detail: label });
    backend = model.backend;
    config = model.config;
    candidates = model.entities.count;
    const ranks = reply.subjectRank && reply.objectRank ? { subjectRank: reply.subjectRank, objectRank: reply.objectRank } : undefined;
    return { model, logits: reply.logits, ranks };
  };

  const workers: FoldWorker[] = [];
  try {
    for (let w = 0; w < wanted; w++) workers.push(await FoldWorker.start(graph));
    const runners = workers.length > 0 ? workers.map(runThere) : [runHere];
    const queue = Array.from({ length: k }, (_, f) => f);
    await Promise.all(
      runners.map(async (runner) => {
        for (let f = queue.shift(); f !== undefined; f = queue.shift()) {
          const exclude = new Uint8Array(graph.size);
          const members: number[] = [];
          for (let i = 0; i < graph.size; i++) {
            if (foldOf[i] === f) {
              exclude[i] = 1;
              members.push(i);
            }
          }
          const foldTriples = Int32Array.from(members);
          const { model, logits, ranks } = await runner(f, exclude, foldTriples);
          let kept = false;
          try {
            epochs[f] = model.history.length === 0 ? 0 : model.history[model.history.length - 1]!.epoch;
            foldTriples.forEach((t, j) => {
              const at = position[t]!;
              logit[at] = logits[j]!;
              if (ranks && subjectRank && objectRank) {
                subjectRank[at] = ranks.subjectRank[j]!;
                objectRank[at] = ranks.objectRank[j]!;
              }
            });
            progress({ phase: 'score', done: epochs.filter((e) => e !== undefined).length, total: k });
            if (options.keep) {
              options.keep(f, model);
              kept = true;
            }
          } finally {
            if (!kept) model.dispose();
          }
        }
      }),
    );
  } catch (error) {
    for (const w of workers) await w.stop();
    throw error;
  } finally {
    for (const m of halfModels) m?.dispose();
  }
  // Workers whose models were handed out stay up until the caller disposes those models.
  if (!options.keep) for (const w of workers) await w.stop();

  const result: CrossFitResult = {
    workers,
    triples: scored,
    predicate: Int32Array.from(scored, (t) => graph.p[t]!),
    logit,
    candidates,
    fold,
    folds: k,
    backend,
    seconds: { fit: fitSeconds, score: scoreSeconds },
    epochs,
    config,
  };
  if (subjectRank && objectRank) {
    result.subjectRank = subjectRank;
    result.objectRank = objectRank;
  }
  return result;
}

import type { Graph } from '../../src/graph/store.js';
import { indexGraph } from '../../src/model/indexing.js';
import { DEFAULT_MODEL_CONFIG } from '../../src/model/config.js';
import type { FitOptions, TrainedModel } from '../../src/model/types.js';

/**
 * A stand-in for `fit` that *memorises*: its logit for a triple it trained on is 100 higher than for
 * one it did not. Any leak of a held-out triple into training shows as a logit ≥ 100.
 * Otherwise the logit is a fixed function of the indexes, so folds agree on unseen triples.
 */
export interface FakeFit {
  fit: (graph: Graph, options?: FitOptions) => Promise<TrainedModel>;
  calls: Array<{ exclude: Uint8Array | undefined; warmStart: TrainedModel | undefined; epochs: number | undefined; seed: number | undefined }>;
  live: () => number;
}

export function fakeFit(): FakeFit {
  const calls: FakeFit['calls'] = [];
  let live = 0;
  const fit = async (graph: Graph, options: FitOptions = {}): Promise<TrainedModel> => {
    const { entities, relations } = indexGraph(graph);
    calls.push({ exclude: options.exclude, warmStart: options.warmStart, epochs: options.epochs, seed: options.seed });
    const trained = new Set<string>();
    for (let t = 0; t < graph.size; t++) {
      if (options.exclude?.[t]) continue;
      const s = entities.ofTerm[graph.s[t]!]!, r = relations.ofTerm[graph.p[t]!]!, o = entities.ofTerm[graph.o[t]!]!;
      if (s >= 0 && r >= 0 && o >= 0) trained.add(`${s} ${r} ${o}`);
    }
    const logit = (s: number, r: number, o: number): number => (trained.has(`${s} ${r} ${o}`) ? 100 : 0) + Math.sin(s * 7 + r * 3 + o * 13);
    live++;
    let disposed = false;
    const model: TrainedModel = {
      config: { ...DEFAULT_MODEL_CONFIG, ...(options.epochs === undefined ? {} : { epochs: options.epochs }) },
      backend: 'cpu',
      entities,
      relations,
      history: [{ epoch: options.epochs ?? 3, loss: 0.5, seconds: 0 }],
      score: async (s, r, o) => Float32Array.from(s, (x, i) => logit(x, r[i]!, o[i]!)),
      scoreObjects: async (s, r) => {
        const out = new Float32Array(s.length * entities.count);
        for (let q = 0; q < s.length; q++) for (let e = 0; e < entities.count; e++) out[q * entities.count + e] = logit(s[q]!, r[q]!, e);
        return out;
      },
      scoreSubjects: async (r, o) => {
        const out = new Float32Array(o.length * entities.count);
        for (let q = 0; q < o.length; q++) for (let e = 0; e < entities.count; e++) out[q * entities.count + e] = logit(e, r[q]!, o[q]!);
        return out;
      },
      save: async () => {},
      dispose: () => {
        if (!disposed) live--;
        disposed = true;
      },
    };
    return model;
  };
  return { fit, calls, live: () => live };
}

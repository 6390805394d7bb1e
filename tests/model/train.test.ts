import { describe, expect, it } from 'vitest';
import { PlumbError } from '../../src/errors.js';
import { graphFromKeys } from '../../src/graph/store.js';
import { fit } from '../../src/model/index.js';
import { autoBatchSize } from '../../src/model/train.js';
import type { FitOptions, TrainedModel } from '../../src/model/types.js';
import type { ProgressEvent } from '../../src/progress.js';
import { filteredRanks, knownFromGraph } from '../../src/scoring/ranking.js';
import { linkPredictionMetrics } from '../../src/evaluation/link-prediction.js';
import { groupedGraph } from './synthetic.js';

const SMALL: FitOptions = { backend: 'wasm', dim: 16, epochs: 40, patience: 8, negatives: 4 };

const graph = groupedGraph();
// Every tenth triple is held out: hidden from training and from message passing.
const hidden = new Uint8Array(graph.size);
for (let t = 0; t < graph.size; t += 10) hidden[t] = 1;
const heldOut = Int32Array.from({ length: Math.ceil(graph.size / 10) }, (_, i) => i * 10);

async function heldOutMrr(model: TrainedModel): Promise<number> {
  const ranks = await filteredRanks(model, graph, heldOut, { known: knownFromGraph(model, graph) });
  return linkPredictionMetrics(ranks.objectRank, ranks.subjectRank).mrr;
}

describe('fit', () => {
  it.each(['rgcn', 'none'] as const)('learns the structure of a small graph (encoder %s)', async (encoder) => {
    const model = await fit(graph, { ...SMALL, encoder, exclude: hidden });
    // 60 entities: a random order gets an MRR of about 0.08; the grouping leaves ~10 plausible objects.
    expect(await heldOutMrr(model)).toBeGreaterThan(0.2);
    expect(model.history.length).toBeGreaterThan(0);
    expect(model.history.every((h) => Number.isFinite(h.loss))).toBe(true);
    model.dispose();
  });

  it('is repeatable under a seed on one backend, and differs under another seed', async () => {
    const options: FitOptions = { ...SMALL, epochs: 3, seed: 7, dropout: 0.3, edgeDropout: 0.3 };
    const a = await fit(graph, options);
    const b = await fit(graph, options);
    const c = await fit(graph, { ...options, seed: 8 });
    const s = Int32Array.of(0, 1, 2, 3);
    const r = Int32Array.of(0, 1, 2, 0);
    const [sa, sb, sc] = await Promise.all([a, b, c].map((m) => m.scoreObjects(s, r)));
    expect(Array.from(sb!)).toEqual(Array.from(sa!));
    expect(b.history.map((h) => h.loss)).toEqual(a.history.map((h) => h.loss));
    expect(Array.from(sc!)).not.toEqual(Array.from(sa!));
    for (const m of [a, b, c]) m.dispose();
  });

  it('never passes messages over hidden triples: an entity seen only in hidden triples gets no evidence', async () => {
    // e100 and e101 occur only in hidden triples; with nothing to learn from, both start from the
    // mean input row and have no neighbours, so the model cannot tell them apart.
    const keys: [string, string, string][] = [];
    for (let t = 0; t < graph.size; t++) keys.push([graph.terms.key(graph.s[t]!), graph.terms.key(graph.p[t]!), graph.terms.key(graph.o[t]!)]);
    keys.push(['http://example.org/e100', 'http://example.org/p0', 'http://example.org/e1']);
    keys.push(['http://example.org/e2', 'http://example.org/p1', 'http://example.org/e101']);
    const g = graphFromKeys(keys);
    const exclude = new Uint8Array(g.size);
    exclude[g.size - 1] = exclude[g.size - 2] = 1;
    const model = await fit(g, { ...SMALL, epochs: 3, exclude });
    const e100 = model.entities.ofTerm[g.terms.id('http://example.org/e100')]!;
    const e101 = model.entities.ofTerm[g.terms.id('http://example.org/e101')]!;
    const a = await model.scoreObjects(Int32Array.of(e100), Int32Array.of(0));
    const b = await model.scoreObjects(Int32Array.of(e101), Int32Array.of(0));
    expect(Array.from(a)).toEqual(Array.from(b));
    // Without hiding them, the encoder builds each from its neighbour and they differ.
    const seen = await fit(g, { ...SMALL, epochs: 3 });
    const c = await seen.scoreObjects(Int32Array.of(e100), Int32Array.of(0));
    const d = await seen.scoreObjects(Int32Array.of(e101), Int32Array.of(0));
    expect(Array.from(c)).not.toEqual(Array.from(d));
    model.dispose();
    seen.dispose();
  });

  it('reports progress and keeps a validation MRR per epoch', async () => {
    const events: ProgressEvent[] = [];
    const valid = Int32Array.from({ length: 40 }, (_, i) => i * 3 + 1);
    const model = await fit(graph, { ...SMALL, epochs: 4, patience: 100, valid, progress: (e) => events.push(e) });
    expect(events.map((e) => e.done)).toEqual([1, 2, 3, 4]);
    expect(events[0]).toMatchObject({ phase: 'fit', total: 4 });
    expect(events[0]!.detail).toMatch(/^epoch 1\/4 loss \d+\.\d+ mrr \d\.\d{3} eta \d+s$/);
    expect(model.history.every((h) => h.validMrr !== undefined && h.validMrr > 0 && h.validMrr <= 1)).toBe(true);
    model.dispose();
  });

  it('stops at maxSeconds with a usable model', async () => {
    const started = performance.now();
    const model = await fit(graph, { ...SMALL, epochs: 10_000, patience: 10_000, maxSeconds: 1 });
    expect((performance.now() - started) / 1000).toBeLessThan(30);
    expect(model.history.length).toBeLessThan(10_000);
    const scores = await model.score(Int32Array.of(0), Int32Array.of(0), Int32Array.of(1));
    expect(Number.isFinite(scores[0]!)).toBe(true);
    model.dispose();
  });

  it('warm-starts from an earlier model: the first epoch starts where that one ended', async () => {
    const first = await fit(graph, { ...SMALL, epochs: 15 });
    const cold = await fit(graph, { ...SMALL, epochs: 1 });
    const warm = await fit(graph, { ...SMALL, epochs: 1, warmStart: first });
    expect(warm.history[0]!.loss).toBeLessThan(cold.history[0]!.loss);
    for (const m of [first, cold, warm]) m.dispose();
  });

  it('refuses what it cannot train, with a sentence saying why', async () => {
    const literals = graphFromKeys([['http://example.org/a', 'http://example.org/name', '"A"']]);
    await expect(fit(literals, SMALL)).rejects.toMatchObject({ code: 'E_INPUT' });
    await expect(fit(graph, { ...SMALL, decomposition: 'block', blocks: 3 })).rejects.toThrow(/not a multiple of 3/);
    await expect(fit(graph, { ...SMALL, exclude: new Uint8Array(3) })).rejects.toBeInstanceOf(PlumbError);
  });
});

describe('autoBatchSize', () => {
  it('makes about eight steps an epoch, within bounds', () => {
    expect(autoBatchSize(5216)).toBe(652);
    expect(autoBatchSize(100)).toBe(100);
    expect(autoBatchSize(300_000)).toBe(32_768);
  });
});

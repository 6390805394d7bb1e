import { describe, expect, it } from 'vitest';
import { graphFromKeys } from '../../src/graph/store.js';
import { literalKey } from '../../src/graph/terms.js';
import { assignFolds, crossFit, scorableTriples } from '../../src/scoring/crossfit.js';
import { fakeFit } from './fake-model.js';

const ex = (x: string): string => `http://example.org/${x}`;
const rows: Array<[string, string, string]> = [];
for (let i = 0; i < 40; i++) rows.push([ex(`e${i}`), ex(`p${i % 3}`), ex(`e${(i * 7 + 3) % 40}`)]);
rows.push([ex('e1'), ex('name'), literalKey('one')]);
const graph = graphFromKeys(rows);

describe('assignFolds', () => {
  it('spreads the selected triples evenly and leaves the rest out', () => {
    const selected = Uint8Array.from({ length: 23 }, (_, i) => (i % 5 === 0 ? 0 : 1));
    const fold = assignFolds(selected, 4, 9);
    const sizes = [0, 0, 0, 0];
    fold.forEach((f, i) => {
      if (!selected[i]) expect(f).toBe(-1);
      else sizes[f]!++;
    });
    expect(Math.max(...sizes) - Math.min(...sizes)).toBeLessThanOrEqual(1);
    expect(assignFolds(selected, 4, 9)).toEqual(fold);
  });
});

describe('crossFit', () => {
  it('scores every scorable triple once, with a model that never trained on it', async () => {
    const fake = fakeFit();
    const result = await crossFit(graph, { folds: 4, fit: fake.fit, seed: 3 });
    expect(Array.from(scorableTriples(graph)).filter((x) => x).length).toBe(40);
    expect(result.triples).toHaveLength(40);
    expect(Array.from(result.triples)).toEqual(Array.from({ length: 40 }, (_, i) => i));
    expect(fake.calls).toHaveLength(4);
    // The memorising stand-in scores ≥ 99 for anything it trained on: no out-of-fold logit may.
    for (const v of result.logit) {
      expect(Number.isNaN(v)).toBe(false);
      expect(v).toBeLessThan(99);
    }
    // Each fold model hid exactly its own fold.
    fake.calls.forEach((call, f) => {
      const hidden = Array.from(call.exclude!).flatMap((x, i) => (x ? [i] : []));
      const members = Array.from(result.triples).filter((_, j) => result.fold[j] === f);
      expect(hidden).toEqual(members);
    });
    expect(fake.live()).toBe(0);
    expect(result.folds).toBe(4);
    expect(result.epochs).toEqual([3, 3, 3, 3]);
  });

  it('with `only`, scores just those triples and keeps the rest as context in every fold', async () => {
    const fake = fakeFit();
    const only = Uint8Array.from({ length: graph.size }, (_, i) => (i >= 30 ? 1 : 0));
    const result = await crossFit(graph, { folds: 2, fit: fake.fit, only });
    expect(Array.from(result.triples)).toEqual(Array.from({ length: 10 }, (_, i) => 30 + i));
    for (const call of fake.calls) for (let i = 0; i < 30; i++) expect(call.exclude![i]).toBe(0);
    for (const v of result.logit) expect(v).toBeLessThan(99);
  });

  it('warm-starts each fold from a half model that also hid that fold', async () => {
    const fake = fakeFit();
    const result = await crossFit(graph, { folds: 4, fit: fake.fit, warmStart: 'half', model: { epochs: 10 }, warmEpochShare: 0.3 });
    expect(fake.calls).toHaveLength(6);
    const [h0, h1, ...folds] = fake.calls;
    folds.forEach((call, f) => {
      const half = f < 2 ? h0! : h1!;
      expect(call.epochs).toBe(3);
      // The warm model is the half model whose exclusion covers this fold.
      for (let i = 0; i < graph.size; i++) if (call.exclude![i]) expect(half.exclude![i]).toBe(1);
    });
    for (const v of result.logit) expect(v).toBeLessThan(99);
    expect(fake.live()).toBe(0);
  });

  it('computes filtered ranks when asked, through the rank function', async () => {
    const fake = fakeFit();
    const seen: number[] = [];
    const result = await crossFit(graph, {
      folds: 2,
      fit: fake.fit,
      ranks: true,
      rank: async (_m, _g, triples) => {
        seen.push(...triples);
        return { objectRank: Float64Array.from(triples, (t) => t + 1), subjectRank: Float64Array.from(triples, () => 2), score: new Float32Array(triples.length) };
      },
    });
    expect(seen.sort((a, b) => a - b)).toEqual(Array.from(result.triples));
    expect(Array.from(result.objectRank!)).toEqual(Array.from(result.triples, (t) => t + 1));
    await expect(crossFit(graph, { folds: 2, fit: fake.fit, ranks: true })).rejects.toThrow(/rank function/);
    await expect(crossFit(graph, { folds: 1, fit: fake.fit })).rejects.toThrow(/folds/);
  });
});

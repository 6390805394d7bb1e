import { describe, expect, it } from 'vitest';
import { calibrateByGroup, histogram, plausibility, rankPercentile, type OutOfFoldScores } from '../../src/scoring/plausibility.js';

function scores(logit: number[], predicate: number[], ranks?: { s: number[]; o: number[]; candidates: number }): OutOfFoldScores {
  const out: OutOfFoldScores = {
    triples: Int32Array.from(logit.map((_, i) => i)),
    predicate: Int32Array.from(predicate),
    logit: Float32Array.from(logit),
    candidates: ranks?.candidates ?? 0,
  };
  if (ranks) {
    out.subjectRank = Float64Array.from(ranks.s);
    out.objectRank = Float64Array.from(ranks.o);
  }
  return out;
}

describe('calibrateByGroup', () => {
  it('is the share of the same predicate’s other triples that scored lower, ties half (prior 0)', () => {
    const v = Float64Array.from([1, 2, 2, 5, 100, 200, 300]);
    const g = Int32Array.from([0, 0, 0, 0, 1, 1, 1]);
    const p = calibrateByGroup(v, g, 0);
    // Group 0: 1 → 0/3; 2 → (1 + ½)/3 each; 5 → 3/3.
    expect(Array.from(p.subarray(0, 4))).toEqual([0, 0.5, 0.5, 1]);
    expect(Array.from(p.subarray(4))).toEqual([0, 0.5, 1]);
  });

  it('makes predicates with different score scales comparable', () => {
    // Predicate 1's logits are predicate 0's times 10 plus 50: the same ordering, a different scale.
    const base = [0.3, -1.2, 2.5, 0.9, 1.7, -0.4];
    const v = Float64Array.from([...base, ...base.map((x) => 10 * x + 50)]);
    const g = Int32Array.from([...base.map(() => 0), ...base.map(() => 1)]);
    const p = calibrateByGroup(v, g, 0);
    for (let i = 0; i < base.length; i++) expect(p[i]).toBeCloseTo(p[i + base.length]!, 12);
    // Without calibration the global share would put every triple of predicate 1 above predicate 0.
    expect(Math.min(...p.subarray(base.length))).toBe(0);
  });

  it('pulls small predicates towards the whole graph', () => {
    // A predicate with a single triple has no evidence of its own: its plausibility is the global share.
    const v = Float64Array.from([0, 1, 2, 3, 4, 5, 6, 7, 8, 3.5]);
    const g = Int32Array.from([0, 0, 0, 0, 0, 0, 0, 0, 0, 1]);
    const p = calibrateByGroup(v, g, 10);
    expect(p[9]).toBeCloseTo(4 / 9, 12); // four of the other nine are lower
    // The lowest of predicate 0 is 0 locally and globally.
    expect(p[0]).toBe(0);
    // Shrinkage: the best of a 3-triple predicate is not 1.
    const q = calibrateByGroup(Float64Array.from([0, 1, 2, 10, 11, 12, 13, 14]), Int32Array.from([1, 1, 1, 0, 0, 0, 0, 0]), 10);
    expect(q[2]).toBeGreaterThan(0.3);
    expect(q[2]).toBeLessThan(0.5);
  });
});

describe('plausibility', () => {
  it('stays in [0, 1] and orders by logit within a predicate', () => {
    const s = scores([3, -2, 0.5, 1, 7, -9], [4, 4, 4, 4, 9, 9]);
    const p = plausibility(s);
    for (const x of p) {
      expect(x).toBeGreaterThanOrEqual(0);
      expect(x).toBeLessThanOrEqual(1);
    }
    expect(p[1]).toBeLessThan(p[2]!);
    expect(p[2]).toBeLessThan(p[3]!);
    expect(p[3]).toBeLessThan(p[0]!);
  });

  it('rank basis uses the mean filtered-rank percentile', () => {
    const ranks = { s: [1, 1, 11], o: [1, 11, 11], candidates: 11 };
    expect(Array.from(rankPercentile(scores([0, 0, 0], [0, 0, 0], ranks)))).toEqual([1, 0.5, 0]);
    const p = plausibility(scores([0, 0, 0], [0, 0, 0], ranks), { basis: 'rank', prior: 0 });
    expect(Array.from(p)).toEqual([1, 0.5, 0]);
    // Combined: the mean of both shares (logits all tie at ½: 0.75, 0.5, 0.25), placed again among the predicate's triples.
    const c = plausibility(scores([0, 0, 0], [0, 0, 0], ranks), { basis: 'combined', prior: 0 });
    expect(Array.from(c)).toEqual([1, 0.5, 0]);
    // The combined figure is a share again: its lowest value in a large predicate is 0.
    const n = 50;
    const big = scores(Array.from({ length: n }, (_, i) => Math.sin(i)), Array(n).fill(0), { s: Array.from({ length: n }, (_, i) => 1 + ((i * 7) % n)), o: Array.from({ length: n }, (_, i) => 1 + ((i * 11) % n)), candidates: n });
    expect(Math.min(...plausibility(big, { basis: 'combined', prior: 0 }))).toBe(0);
    expect(() => plausibility(scores([0], [0]), { basis: 'rank' })).toThrow(/ranks/);
  });

  it('histogram bins [0, 1] into 20 bins, 1 in the last', () => {
    const h = histogram([0, 0.04, 0.05, 0.5, 0.99, 1, Number.NaN]);
    expect(h).toHaveLength(20);
    expect(h[0]).toBe(2);
    expect(h[1]).toBe(1);
    expect(h[10]).toBe(1);
    expect(h[19]).toBe(2);
    expect(h.reduce((a, b) => a + b, 0)).toBe(6);
  });
});

import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  averagePrecision,
  detectionMetrics,
  detectionTable,
  precisionAt,
  recallAtShare,
  rocAuc,
} from '../../src/evaluation/detection.js';

/**
 * Fawcett 2006, "An introduction to ROC analysis", Pattern Recognition Letters 27:861–874, Fig. 3:
 * twenty test instances, ten positive, with the scores a scoring classifier gave them
 * (from memory; the AUC below is counted here from the table, pair by pair).
 */
const FAWCETT_FIG3: Array<[number, 0 | 1]> = [
  [0.9, 1], [0.8, 1], [0.7, 0], [0.6, 1], [0.55, 1], [0.54, 1], [0.53, 0], [0.52, 0], [0.51, 1], [0.505, 0],
  [0.4, 1], [0.39, 0], [0.38, 1], [0.37, 0], [0.36, 0], [0.35, 0], [0.34, 1], [0.33, 0], [0.3, 1], [0.1, 0],
];

/** Manning, Raghavan & Schütze 2008, "Introduction to Information Retrieval", Exercise 8.9 (from memory): a ranked list, R relevant. */
const MRS_EX89 = 'RRNNNNNNRNRNNNRNNNNR';

function split(rows: Array<[number, 0 | 1]>): { s: Float64Array; l: Uint8Array } {
  return { s: Float64Array.from(rows.map((r) => r[0])), l: Uint8Array.from(rows.map((r) => r[1])) };
}

/** Mann–Whitney count: the probability a random error outranks a random true item, ties half. */
function pairAuc(s: ArrayLike<number>, l: ArrayLike<number>): number {
  let credit = 0, pairs = 0;
  for (let i = 0; i < s.length; i++) {
    if (!l[i]) continue;
    for (let j = 0; j < s.length; j++) {
      if (l[j]) continue;
      pairs++;
      credit += s[i]! > s[j]! ? 1 : s[i] === s[j] ? 0.5 : 0;
    }
  }
  return credit / pairs;
}

/** AP of one strict order (labels listed in rank order), the textbook definition. */
function plainAp(labels: number[]): number {
  let hits = 0, sum = 0;
  labels.forEach((l, i) => {
    if (l) sum += ++hits / (i + 1);
  });
  return sum / hits;
}

/** Mean of a metric over every order that breaks the ties of `s` (all permutations within groups). */
function overTieOrders(s: number[], l: number[], metric: (ordered: number[]) => number): number {
  const values = [...new Set(s)].sort((a, b) => b - a);
  const blocks = values.map((v) => l.filter((_, i) => s[i] === v));
  const perms = (xs: number[]): number[][] =>
    xs.length <= 1 ? [xs] : xs.flatMap((x, i) => perms([...xs.slice(0, i), ...xs.slice(i + 1)]).map((p) => [x, ...p]));
  let total = 0, count = 0;
  const walk = (b: number, prefix: number[]): void => {
    if (b === blocks.length) {
      total += metric(prefix);
      count++;
      return;
    }
    for (const p of perms(blocks[b]!)) walk(b + 1, [...prefix, ...p]);
  };
  walk(0, []);
  return total / count;
}

describe('ROC-AUC', () => {
  it('matches the pair count on Fawcett 2006 Fig. 3', () => {
    // Source: Fawcett 2006, Fig. 3 (table from memory); 68 of the 100 (positive, negative) pairs are ordered right.
    const { s, l } = split(FAWCETT_FIG3);
    expect(rocAuc(s, l)).toBeCloseTo(0.68, 12);
    expect(rocAuc(s, l)).toBeCloseTo(pairAuc(s, l), 12);
  });

  it('gives tied pairs half credit, the trapezoid of Fawcett 2006 Algorithm 2', () => {
    // Source: Fawcett 2006, §5 and Algorithm 2: a run of tied scores adds a diagonal segment (trapezoid area).
    // Tie instances 3–6 (n p p p) and 13–14 (p n) of Fig. 3.
    const rows = FAWCETT_FIG3.map(([v, c], i): [number, 0 | 1] => [i >= 2 && i <= 5 ? 0.6 : i === 12 || i === 13 ? 0.375 : v, c]);
    const { s, l } = split(rows);
    // Before tying, 0.68; instance 3 (n) now ties 3 positives (it was above them: +1.5), instance 14 ties 13 (was below: −0.5).
    expect(rocAuc(s, l)).toBeCloseTo(0.69, 12);
    expect(rocAuc(s, l)).toBeCloseTo(pairAuc(s, l), 12);
  });

  it('is 1 for a perfect order, 0 for a reversed one, 0.5 when all tie', () => {
    expect(rocAuc([3, 2, 1], [1, 0, 0])).toBe(1);
    expect(rocAuc([1, 2, 3], [1, 0, 0])).toBe(0);
    expect(rocAuc([1, 1, 1, 1], [1, 0, 1, 0])).toBe(0.5);
    expect(rocAuc([1, 2], [0, 0])).toBeNaN();
  });
});

describe('average precision', () => {
  it('averages the precisions at each relevant position (Manning et al. 2008 §8.4, Exercise 8.9)', () => {
    // Source: Manning, Raghavan & Schütze 2008, Exercise 8.9 (from memory): relevant at ranks 1, 2, 9, 11, 15, 20;
    // AP = (1 + 1 + 3/9 + 4/11 + 5/15 + 6/20) / 6 ≈ 0.555, precision at 20 = 6/20.
    const l = [...MRS_EX89].map((c) => (c === 'R' ? 1 : 0));
    const s = l.map((_, i) => 20 - i);
    expect(averagePrecision(s, l)).toBeCloseTo((1 + 1 + 3 / 9 + 4 / 11 + 5 / 15 + 6 / 20) / 6, 12);
    expect(averagePrecision(s, l)).toBeCloseTo(0.555, 3);
    expect(precisionAt(s, l, 20)).toBeCloseTo(0.3, 12);
    // Uninterpolated precision at 25% recall (2 of the 8 relevant documents the exercise assumes): rank 2, precision 1.
    expect(precisionAt(s, l, 2)).toBe(1);
  });

  it('on Fawcett Fig. 3 ranked by score', () => {
    // Precisions at the positives' ranks 1,2,4,5,6,9,11,13,17,19 (counted from the Fig. 3 table).
    const { s, l } = split(FAWCETT_FIG3);
    const expected = (1 + 1 + 3 / 4 + 4 / 5 + 5 / 6 + 6 / 9 + 7 / 11 + 8 / 13 + 9 / 17 + 10 / 19) / 10;
    expect(averagePrecision(s, l)).toBeCloseTo(expected, 12);
  });

  it('scores a group of ties as the mean over every order within it (McSherry & Najork 2008)', () => {
    // Source: McSherry & Najork 2008 (tie-aware measures), checked here by enumerating every tie order.
    const s = [5, 4, 4, 4, 4, 2, 2, 1];
    const l = [0, 1, 0, 1, 1, 0, 1, 0];
    expect(averagePrecision(s, l)).toBeCloseTo(overTieOrders(s, l, plainAp), 12);
    // All tied: the expected AP of a random order.
    expect(averagePrecision([1, 1, 1, 1], [1, 0, 0, 0])).toBeCloseTo(overTieOrders([1, 1, 1, 1], [1, 0, 0, 0], plainAp), 12);
    expect(averagePrecision([1, 1, 1, 1], [1, 0, 0, 0])).toBeCloseTo((1 + 1 / 2 + 1 / 3 + 1 / 4) / 4, 12);
  });

  it('equals the enumerated tie-order mean on random small inputs', () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.integer({ min: 0, max: 3 }), fc.integer({ min: 0, max: 1 })), { minLength: 1, maxLength: 7 }),
        (rows) => {
          const s = rows.map((r) => r[0]);
          const l = rows.map((r) => r[1]);
          if (!l.some((x) => x)) return;
          expect(averagePrecision(s, l)).toBeCloseTo(overTieOrders(s, l, plainAp), 10);
          const k = l.filter((x) => x).length;
          const pAtK = (ordered: number[]): number => ordered.slice(0, k).filter((x) => x).length / k;
          expect(precisionAt(s, l, k)).toBeCloseTo(overTieOrders(s, l, pAtK), 10);
          if (l.some((x) => !x)) expect(rocAuc(s, l)).toBeCloseTo(pairAuc(s, l), 10);
        },
      ),
      { numRuns: 300 },
    );
  });

  it('is NaN without errors, and ranks NaN scores last', () => {
    expect(averagePrecision([1, 2], [0, 0])).toBeNaN();
    expect(averagePrecision([Number.NaN, 1, 0], [0, 1, 0])).toBe(1);
  });
});

describe('precision@K, recall in the top share, the table', () => {
  it('counts a straddling tie group pro rata', () => {
    // Top 2 are one certain error and half of a tied pair (one error, one not).
    expect(precisionAt([3, 2, 2, 0], [1, 1, 0, 0], 2)).toBeCloseTo(0.75, 12);
    expect(recallAtShare([3, 2, 2, 0], [1, 1, 0, 0], 0.25)).toBeCloseTo(0.5, 12);
  });

  it('recall in the top 1% looks at ⌈n/100⌉ items', () => {
    const n = 250;
    const s = Array.from({ length: n }, (_, i) => n - i);
    const l = Array.from({ length: n }, (_, i) => (i === 0 || i === 2 || i === 3 || i === 100 ? 1 : 0));
    const m = detectionMetrics(s, l);
    expect(m.recallAt1pct).toBeCloseTo(2 / 4, 12); // top 3: items 0 and 2
    expect(m.precisionAtK).toBeCloseTo(3 / 4, 12); // top 4: items 0, 2, 3
    expect(m.errors).toBe(4);
    expect(m.total).toBe(n);
  });

  it('measures each kind against the true triples alone', () => {
    const s = [9, 8, 7, 6, 5, 4];
    const kinds = ['a', null, 'b', null, 'a', null];
    const t = detectionTable(s, kinds);
    expect(t.overall.errors).toBe(3);
    expect(t.byKind.a!.errors).toBe(2);
    // Kind a alone: ranked [a, t, t, a, t] → AP = (1 + 2/4) / 2.
    expect(t.byKind.a!.ap).toBeCloseTo((1 + 2 / 4) / 2, 12);
    // Kind b alone: [t, b, t, t] → AP = 1/2.
    expect(t.byKind.b!.ap).toBeCloseTo(0.5, 12);
    expect(Object.keys(t.byKind)).toEqual(['a', 'b']);
  });
});

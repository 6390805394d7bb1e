import { describe, expect, it } from 'vitest';
import { linkPredictionMetrics } from '../../src/evaluation/link-prediction.js';

// MRR and Hits@k as defined for filtered link prediction (Bordes et al. 2013; Schlichtkrull et al.
// 2018 §5.2 report MRR and Hits@1/3/10 averaged over subject and object queries).
describe('link-prediction metrics', () => {
  it('skips unranked triples and counts them', () => {
    const m = linkPredictionMetrics(Float64Array.of(1, NaN, 10), Float64Array.of(2, 5, 11));
    expect(m).toMatchObject({ queries: 4, triples: 2, skipped: 1 });
    expect(m.mrr).toBeCloseTo((1 + 1 / 2 + 1 / 10 + 1 / 11) / 4, 12);
    expect(m.hits1).toBe(0.25);
    expect(m.hits3).toBe(0.5);
    expect(m.hits10).toBe(0.75);
  });

  it('reports zeros rather than NaN when nothing could be ranked', () => {
    expect(linkPredictionMetrics([], [])).toMatchObject({ mrr: 0, hits1: 0, queries: 0 });
  });
});

import { describe, expect, it } from 'vitest';
import { graphFromKeys } from '../../src/graph/store.js';
import { literalKey } from '../../src/graph/terms.js';
import { degreeHeuristic, randomOrder, suspicionFromPlausibility } from '../../src/scoring/baselines.js';
import { compareMethods, comparisonJson, formatComparison } from '../../src/evaluation/compare.js';
import { corruptGraph } from '../../src/evaluation/corrupt.js';
import { fakeFit } from './fake-model.js';

const ex = (x: string): string => `http://example.org/${x}`;

describe('baselines', () => {
  it('degree heuristic: −(ln deg s + ln deg o), rarer pairs more suspect', () => {
    const g = graphFromKeys([
      [ex('hub'), ex('p'), ex('a')],
      [ex('hub'), ex('p'), ex('b')],
      [ex('hub'), ex('p'), ex('c')],
      [ex('x'), ex('p'), ex('y')],
    ]);
    const d = degreeHeuristic(g);
    expect(d[0]).toBeCloseTo(-(Math.log(3) + Math.log(1)), 12);
    expect(d[3]).toBeCloseTo(0, 12);
    expect(d[3]).toBeGreaterThan(d[0]!);
  });

  it('random order is seeded', () => {
    const g = graphFromKeys([[ex('a'), ex('p'), ex('b')], [ex('b'), ex('p'), ex('c')]]);
    expect(randomOrder(g, 4)).toEqual(randomOrder(g, 4));
    expect(randomOrder(g, 4)).not.toEqual(randomOrder(g, 5));
  });

  it('suspicion from plausibility leaves unscored triples NaN', () => {
    const g = graphFromKeys([[ex('a'), ex('p'), ex('b')], [ex('a'), ex('q'), literalKey('x')]]);
    const s = suspicionFromPlausibility(g, Int32Array.of(0), [0.25]);
    expect(s[0]).toBe(0.75);
    expect(s[1]).toBeNaN();
  });
});

describe('compareMethods', () => {
  // A graph with skewed degrees: entity i links to about 40/(i+1) others, so uniform noise meets rare entities.
  const rows: Array<[string, string, string]> = [];
  for (let i = 0; i < 60; i++) for (let j = 0; j < Math.ceil(40 / (i + 1)); j++) rows.push([ex(`e${i}`), ex(`p${j % 2}`), ex(`e${(i + 1 + j * 3) % 15}`)]);
  const base = graphFromKeys(rows);
  const { graph, injected, firstInjected } = corruptGraph(base, { rate: 0.1, kinds: ['random'], seed: 2 });
  const kindOf = Array.from({ length: graph.size }, (_, i) => (i >= firstInjected ? injected[i - firstInjected]!.kind : null));

  it('measures each method on the same triples and lays out one table', async () => {
    const result = await compareMethods(graph, kindOf, { methods: ['random', 'degree', 'type-distribution', 'distmult'], fit: fakeFit().fit, folds: 2, basis: 'logit' });
    // type-distribution is skipped without its function.
    expect(result.map((r) => r.method)).toEqual(['random', 'degree', 'distmult']);
    for (const r of result) {
      expect(r.table.overall.errors).toBe(injected.length);
      expect(r.table.overall.total).toBe(graph.size);
    }
    const degree = result.find((r) => r.method === 'degree')!.table.overall.ap;
    const random = result.find((r) => r.method === 'random')!.table.overall.ap;
    expect(degree).toBeGreaterThan(random);
    const text = formatComparison(result);
    expect(text.split('\n')[0]).toMatch(/^method\s+AP\s+ROC-AUC\s+P@K\s+R@1%\s+AP random\s+seconds$/);
    expect(text).toMatch(/degree heuristic/);
    expect(text).toMatch(new RegExp(`${injected.length} errors among ${graph.size} ranked triples`));
    expect(comparisonJson(result)[1]).toMatchObject({ method: 'degree', ap: degree });
  });
});

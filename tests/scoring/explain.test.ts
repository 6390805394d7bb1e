import { describe, expect, it } from 'vitest';
import { graphFromKeys } from '../../src/graph/store.js';
import { RDF_TYPE } from '../../src/graph/terms.js';
import { degree, explainTriples, explanationLine } from '../../src/scoring/explain.js';
import { fakeFit } from './fake-model.js';

const ex = (x: string): string => `http://example.org/${x}`;
// Invented scenario: workshops that stock tools; one tool stocked by a bird.
const rows: Array<[string, string, string]> = [
  [ex('w1'), RDF_TYPE, ex('Workshop')],
  [ex('w2'), RDF_TYPE, ex('Workshop')],
  [ex('w3'), RDF_TYPE, ex('Workshop')],
  [ex('finch'), RDF_TYPE, ex('Bird')],
  [ex('t1'), RDF_TYPE, ex('Tool')],
  [ex('t2'), RDF_TYPE, ex('Tool')],
  [ex('w1'), ex('stocks'), ex('t1')],
  [ex('w1'), ex('stocks'), ex('t2')],
  [ex('w2'), ex('stocks'), ex('t1')],
  [ex('w3'), ex('stocks'), ex('t2')],
  [ex('finch'), ex('stocks'), ex('t2')],
];
const graph = graphFromKeys(rows);

describe('explainTriples', () => {
  it('lists preferred entities (filtered), ranks, types against the predicate’s usual types, and degrees', async () => {
    const model = await fakeFit().fit(graph);
    const target = 10; // finch stocks t2
    const [e] = await explainTriples(model, graph, Int32Array.of(target), { candidates: 2 });
    expect(e).toBeDefined();
    // Types: finch is a Bird; this predicate's subjects are Workshops (4 triples) and a Bird (1).
    expect(e!.subjectTypes).toEqual([ex('Bird')]);
    expect(e!.usualSubjectTypes[0]).toEqual({ type: ex('Workshop'), triples: 4 });
    expect(e!.subjectTypeSupport).toBe(0);
    expect(e!.objectTypeSupport).toBe(4);
    expect(e!.usualObjectTypes).toEqual([{ type: ex('Tool'), triples: 5 }]);
    expect(e!.predicateTriples).toBe(5);
    expect(e!.subjectDegree).toBe(degree(graph, graph.terms.id(ex('finch'))));
    expect(e!.subjectDegree).toBe(2);
    expect(e!.objectDegree).toBe(4);

    // Candidates: computed by hand from the stand-in's scores, skipping known answers and the triple's own term.
    const ent = (k: string): number => model.entities.ofTerm[graph.terms.id(ex(k))]!;
    const s = ent('finch'), o = ent('t2'), r = model.relations.ofTerm[graph.terms.id(ex('stocks'))]!;
    const objects = await model.scoreObjects(Int32Array.of(s), Int32Array.of(r));
    const expected = Array.from({ length: model.entities.count }, (_, i) => i)
      .filter((i) => i !== o)
      .sort((a, b) => objects[b]! - objects[a]!);
    expect(e!.preferredObjects.map((c) => c.term)).toEqual(expected.slice(0, 2).map((i) => graph.terms.key(model.entities.terms[i]!)));
    expect(e!.preferredObjects[0]!.score).toBeGreaterThanOrEqual(e!.preferredObjects[1]!.score);
    expect(e!.objectRank).toBe(expected.filter((i) => objects[i]! > objects[o]!).length + 1);
    // Subject side: w1 and w3 already stock t2, so they are filtered out.
    const filtered = [ent('w1'), ent('w3')];
    expect(e!.preferredSubjects.map((c) => c.term)).not.toContain(ex('w1'));
    expect(e!.preferredSubjects.map((c) => c.term)).not.toContain(ex('w3'));
    expect(e!.preferredSubjects.map((c) => c.term)).not.toContain(ex('finch'));
    expect(filtered.every((x) => x >= 0)).toBe(true);
    expect(e!.score).toBeCloseTo((await model.score(Int32Array.of(s), Int32Array.of(r), Int32Array.of(o)))[0]!, 5);
    expect(explanationLine(e!)).toMatch(/no other subject of this predicate has type .*Bird/);
  });

  it('gives the graph part even where the model cannot place the triple', async () => {
    const model = await fakeFit().fit(graphFromKeys(rows.slice(0, 6)));
    const [e] = await explainTriples(model, graph, Int32Array.of(10));
    expect(e!.objectRank).toBeNaN();
    expect(e!.preferredObjects).toEqual([]);
    expect(e!.subjectTypes).toEqual([ex('Bird')]);
  });
});

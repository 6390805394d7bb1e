import { describe, expect, it } from 'vitest';
import { entityIds, profile, summarize } from '../../src/graph/profile.js';
import { graphFromKeys } from '../../src/graph/store.js';
import { literalKey, RDF_TYPE } from '../../src/graph/terms.js';

const x = (local: string): string => `http://x.example/${local}`;

// A small graph whose numbers are easy to count by hand.
const graph = graphFromKeys([
  [x('a'), RDF_TYPE, x('Person')],
  [x('b'), RDF_TYPE, x('Person')],
  [x('a'), x('knows'), x('b')],
  [x('b'), x('knows'), x('c')],
  [x('a'), x('knows'), x('a')], // a self-loop
  [x('a'), x('name'), literalKey('Ann')],
  [x('b'), x('name'), literalKey('Bo')],
  [x('c'), x('name'), literalKey('Bo')],
  ['_:f0_n', x('knows'), x('a')],
]);

describe('profile', () => {
  const p = profile(graph);

  it('counts triples, entities, predicates, literals and blank nodes', () => {
    expect(p).toMatchObject({
      triples: 9,
      entities: 5,
      blankNodes: 1,
      predicates: 3,
      literals: 2,
      namedGraphs: 0,
    });
    // a, b, c, Person, _:n are entities; "Ann" and "Bo" are literals; the predicates are not entities.
    expect(p.terms).toBe(10);
  });

  it('summarises degrees (subject + object occurrences, a self-loop counted twice)', () => {
    // a: out 4 (type, knows b, knows a, name) + in 2 (from a, from _:n) = 6; b: 3 + 1 = 4; c: 1 + 1 = 2;
    // Person: 0 + 2 = 2; _:n: 1 + 0 = 1.
    expect(p.degree).toEqual({ min: 1, median: 2, mean: 15 / 5, p90: 6, p99: 6, max: 6 });
    expect(p.outDegree.max).toBe(4);
    expect(p.inDegree).toMatchObject({ min: 0, max: 2 });
  });

  it('lists predicates by use with distinct subjects, objects and literal objects', () => {
    expect(
      p.perPredicate.map((r) => [r.predicate, r.triples, r.subjects, r.objects, r.literalObjects]),
    ).toEqual([
      [x('knows'), 4, 3, 3, 0],
      [x('name'), 3, 3, 2, 3],
      [RDF_TYPE, 2, 2, 1, 0],
    ]);
  });

  it('measures rdf:type coverage over entities that are not only classes', () => {
    // Person is only ever a class; of a, b, c and _:n, a and b are typed.
    expect(p.types).toEqual({ typed: 2, of: 4, share: 0.5, classes: 1 });
  });

  it('gives entity ids without literals unless asked', () => {
    const keys = (ids: Int32Array) => Array.from(ids, (id) => graph.terms.key(id)).sort();
    expect(keys(entityIds(graph))).toEqual(['_:f0_n', x('Person'), x('a'), x('b'), x('c')].sort());
    expect(keys(entityIds(graph, { includeLiterals: true }))).toHaveLength(7);
    const ids = entityIds(graph);
    expect(Array.from(ids)).toEqual([...ids].sort((m, n) => m - n));
  });
});

describe('summarize', () => {
  it('uses nearest-rank percentiles and the mean of the middle pair for an even count', () => {
    const values = Int32Array.from({ length: 100 }, (_, i) => 100 - i); // 1..100
    expect(summarize(values)).toEqual({ min: 1, median: 50.5, mean: 50.5, p90: 90, p99: 99, max: 100 });
    expect(summarize(new Int32Array(0))).toEqual({ min: 0, median: 0, mean: 0, p90: 0, p99: 0, max: 0 });
    expect(summarize(Int32Array.of(7))).toMatchObject({ min: 7, median: 7, p99: 7 });
  });
});

import { describe, expect, it } from 'vitest';
import { graphFromKeys, type Graph } from '../../src/graph/store.js';
import { indexGraph } from '../../src/model/indexing.js';
import type { ModelConfig, TrainedModel } from '../../src/model/types.js';
import { DEFAULT_MODEL_CONFIG } from '../../src/model/config.js';
import { KnownTriples, filteredRank, filteredRanks, knownFromGraph, rankTriples } from '../../src/scoring/ranking.js';
import { evaluateLinkPrediction } from '../../src/evaluation/link-prediction.js';

/**
 * A hand-worked example of the filtered protocol (Bordes et al. 2013, §4.2: "we propose to remove
 * from the list of corrupted triplets all the triplets that appear either in the training,
 * validation or test set"), with ties counted half (the mean of the optimistic and pessimistic
 * ranks — common practice, e.g. the "realistic" rank of Berrendorf et al. 2020, from memory).
 *
 * Five entities e0…e4, one predicate p. True triples: (e0 p e1), (e0 p e2), (e3 p e1).
 * Scores are fixed by hand per query row, so every rank below can be checked on paper.
 */
const E = (i: number): string => `http://example.org/e${i}`;
const P = 'http://example.org/p';
const TRUE: [string, string, string][] = [
  [E(0), P, E(1)],
  [E(0), P, E(2)],
  [E(3), P, E(1)],
  // A triple that only introduces e4 as an entity.
  [E(4), 'http://example.org/q', E(4)],
];

/** Rows of candidate scores by anchor entity: objects of (e_s, p, ?) and subjects of (?, p, e_o). */
const OBJECT_ROWS: Record<number, number[]> = {
  0: [0.9, 0.5, 0.7, 0.7, 0.1],
  3: [0.1, 0.3, 0.2, 0.9, 0.0],
};
const SUBJECT_ROWS: Record<number, number[]> = {
  1: [0.2, 0.8, 0.2, 0.6, 0.2],
  2: [0.4, 0.4, 0.4, 0.4, 0.4],
};

function fixedModel(graph: Graph): TrainedModel {
  const { entities, relations } = indexGraph(graph);
  // Entity index i must be e_i for the rows above: the graph interns e0…e4 in that order.
  for (let i = 0; i < 5; i++) expect(graph.terms.key(entities.terms[i]!)).toBe(E(i));
  const row = (table: Record<number, number[]>, anchor: number): number[] => table[anchor] ?? [0, 0, 0, 0, 0];
  return {
    config: DEFAULT_MODEL_CONFIG as ModelConfig,
    backend: 'cpu',
    entities,
    relations,
    history: [],
    score: async (s, _r, o) => Float32Array.from(s, (x, i) => row(OBJECT_ROWS, x)[o[i]!]!),
    scoreObjects: async (s) => Float32Array.from(Array.from(s).flatMap((x) => row(OBJECT_ROWS, x))),
    scoreSubjects: async (_r, o) => Float32Array.from(Array.from(o).flatMap((x) => row(SUBJECT_ROWS, x))),
    save: async () => {},
    dispose: () => {},
  };
}

describe('filtered ranking, worked by hand', () => {
  const graph = graphFromKeys(TRUE);
  const model = fixedModel(graph);

  it('ranks objects and subjects with known triples removed and ties counted half', async () => {
    const ranks = await filteredRanks(model, graph, Int32Array.of(0, 1, 2));
    // (e0 p e1), object: e1 scores 0.5; e0 (0.9) and e3 (0.7) are higher, e2 (0.7) is known true
    // and removed → 1 + 2 = 3 (unfiltered it would be 4).
    expect(ranks.objectRank[0]).toBe(3);
    // (e0 p e1), subject: e0 scores 0.2; e1 (0.8) higher, e3 (0.6) removed (e3 p e1 is true),
    // e2 and e4 tie at 0.2 → 1 + 1 + 2/2 = 3.
    expect(ranks.subjectRank[0]).toBe(3);
    // (e0 p e2), object: e2 scores 0.7; e0 (0.9) higher, e3 ties (0.7), e1 is known but lower → 1 + 1 + 1/2 = 2.5.
    expect(ranks.objectRank[1]).toBe(2.5);
    // (e0 p e2), subject: every candidate ties → 1 + 4/2 = 3, the mean rank of a random order.
    expect(ranks.subjectRank[1]).toBe(3);
    // (e3 p e1), object: e1 scores 0.3 and e3 (0.9) is higher → 2; subject: e3 scores 0.6, e1 (0.8) is higher,
    // e0 is known true (e0 p e1) and removed → 2.
    expect(ranks.objectRank[2]).toBe(2);
    expect(ranks.subjectRank[2]).toBe(2);
    expect(Array.from(ranks.score)).toEqual([Math.fround(0.5), Math.fround(0.7), Math.fround(0.3)]);
  });

  it('gives the same ranks with a known-triple predicate as with a prebuilt index', async () => {
    const index = knownFromGraph(model, graph);
    const known = (s: number, r: number, o: number): boolean => index.has(s, r, o);
    const a = await filteredRanks(model, graph, Int32Array.of(0, 1, 2));
    const b = await filteredRanks(model, graph, Int32Array.of(0, 1, 2), { known, batchSize: 1 });
    expect(Array.from(b.objectRank)).toEqual(Array.from(a.objectRank));
    expect(Array.from(b.subjectRank)).toEqual(Array.from(a.subjectRank));
  });

  it('ranks triples outside the graph and gives NaN where an entity is unknown', async () => {
    const known = knownFromGraph(model, graph);
    // (e0 p e3) is not true: e3 scores 0.7 for (e0, p, ?); e0 (0.9) higher, e2 (0.7) known → removed → 2.
    const ranks = await rankTriples(model, Int32Array.of(0, -1), Int32Array.of(0, 0), Int32Array.of(3, 1), { known });
    expect(ranks.objectRank[0]).toBe(2);
    expect(Number.isNaN(ranks.objectRank[1]!)).toBe(true);
    expect(Number.isNaN(ranks.subjectRank[1]!)).toBe(true);
  });

  it('averages both directions into MRR and Hits@k', async () => {
    const metrics = await evaluateLinkPrediction(model, graph, Int32Array.of(0, 1));
    // Ranks 3, 3, 2.5, 3: MRR = (1/3 + 1/3 + 1/2.5 + 1/3) / 4 = 0.35; none at 1; all within 3.
    expect(metrics.mrr).toBeCloseTo(0.35, 10);
    expect(metrics).toMatchObject({ hits1: 0, hits3: 1, hits10: 1, queries: 4, triples: 2, skipped: 0 });
  });
});

describe('filteredRank', () => {
  it('does not count the target itself nor duplicates of it in the filter', () => {
    const row = Float32Array.of(1, 2, 3);
    expect(filteredRank(row, 0, Int32Array.of(0))).toBe(3);
    expect(filteredRank(row, 2, Int32Array.of())).toBe(1);
    expect(filteredRank(row, 0, Int32Array.of(1, 2))).toBe(1);
  });
});

describe('KnownTriples', () => {
  it('groups both ways and merges duplicates', () => {
    const known = new KnownTriples(Int32Array.of(0, 0, 0, 2, 0), Int32Array.of(1, 1, 0, 1, 1), Int32Array.of(5, 3, 5, 5, 5), 6, 2);
    expect(Array.from(known.objects(0, 1))).toEqual([3, 5]);
    expect(Array.from(known.subjects(1, 5))).toEqual([0, 2]);
    expect(Array.from(known.objects(0, 0))).toEqual([5]);
    expect(Array.from(known.objects(1, 1))).toEqual([]);
    expect(known.has(2, 1, 5)).toBe(true);
    expect(known.has(2, 0, 5)).toBe(false);
  });
});

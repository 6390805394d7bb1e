import { existsSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { profile } from '../../src/graph/profile.js';
import { readGraph } from '../../src/sources/index.js';

/**
 * The three small link-prediction benchmarks, read as TSV edge lists (bare tokens become IRIs under the
 * default base), must have their published numbers of entities and relations over train + valid +
 * test:
 * - UMLS: 135 entities, 46 relations (Kok & Domingos 2007, "Statistical predicate invention", ICML);
 * - Nations: 14 entities, 55 relations, and Kinship: 104 entities, 25 relations (Kemp et al. 2006,
 *   "Learning systems of concepts with an infinite relational model", AAAI);
 * - the split sizes are the ones tabled with these datasets by Dettmers et al. 2018 ("Convolutional
 *   2D knowledge graph embeddings", AAAI) — from memory: UMLS 5,216/652/661, Nations 1,592/199/201,
 *   Kinship 8,544/1,068/1,074.
 */

const repoRoot = fileURLToPath(new URL('../..', import.meta.url));
const datasets = resolve(repoRoot, '../shared/datasets');

const PUBLISHED = {
  // Source: Kok & Domingos 2007 (UMLS); Dettmers et al. 2018 (splits, from memory).
  umls: { entities: 135, relations: 46, splits: [5216, 652, 661] },
  // Source: Kemp et al. 2006 (Nations); Dettmers et al. 2018 (splits, from memory).
  nations: { entities: 14, relations: 55, splits: [1592, 199, 201] },
  // Source: Kemp et al. 2006 (Kinship); Dettmers et al. 2018 (splits, from memory).
  kinship: { entities: 104, relations: 25, splits: [8544, 1068, 1074] },
} as const;

describe('open link-prediction datasets read as TSV', () => {
  it('are present beside the repository (../shared/datasets)', () => {
    expect(existsSync(datasets), `expected the datasets in ${datasets}`).toBe(true);
  });

  for (const [name, expected] of Object.entries(PUBLISHED)) {
    it(`${name}: ${expected.entities} entities and ${expected.relations} relations over the three splits`, async () => {
      const files = ['train', 'valid', 'test'].map((split) => join(datasets, name, `${split}.txt`));
      const read = await readGraph(files);
      expect(read.rejections).toEqual([]);
      expect(read.inputs.map((i) => [i.format, i.statements])).toEqual(
        expected.splits.map((n) => ['tsv', n]),
      );
      const total = expected.splits.reduce((a, b) => a + b, 0);
      expect(read.accounting).toEqual({ read: total, accepted: total, duplicates: 0, rejected: 0 });
      const shape = profile(read.graph);
      expect(shape.entities).toBe(expected.entities);
      expect(shape.predicates).toBe(expected.relations);
      expect(shape.literals).toBe(0);
      // The splits share one vocabulary: every entity of valid and test also occurs in train.
      const trainOnly = await readGraph([files[0]!]);
      expect(profile(trainOnly.graph).entities).toBe(expected.entities);
    });
  }
});

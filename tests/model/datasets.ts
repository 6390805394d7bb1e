import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { GraphBuilder, type Graph } from '../../src/graph/store.js';

/** The repository root, from this file's place in it. */
export const repoRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');

/**
 * Open link-prediction benchmarks kept beside the repository (`../shared/datasets`): UMLS (Kok &
 * Domingos 2007), Nations and Kinship (Kemp et al. 2006), with the splits used since Dettmers et al. 2018.
 */
export const datasetsDir = path.resolve(repoRoot, '../shared/datasets');

export type Split = 'train' | 'valid' | 'test';

export function readSplit(name: string, split: Split): [string, string, string][] {
  const text = readFileSync(path.join(datasetsDir, name, `${split}.txt`), 'utf8');
  const out: [string, string, string][] = [];
  for (const line of text.split('\n')) {
    const parts = line.trim().split('\t');
    if (parts.length !== 3) continue;
    out.push([`urn:${name}:${parts[0]}`, `urn:${name}:r/${parts[1]}`, `urn:${name}:${parts[2]}`]);
  }
  return out;
}

/** A graph of the given splits, in order, and the triple indexes where each split begins. */
export function datasetGraph(name: string, splits: Split[] = ['train', 'valid']): { graph: Graph; ranges: Record<string, [number, number]> } {
  const b = new GraphBuilder();
  const ranges: Record<string, [number, number]> = {};
  for (const split of splits) {
    const f = b.addFile(`${name}/${split}.txt`);
    const start = b.size;
    readSplit(name, split).forEach(([s, p, o], i) => b.addKeys(s, p, o, undefined, f, i + 1));
    ranges[split] = [start, b.size];
  }
  return { graph: b.build(), ranges };
}

import path from 'node:path';
import type { Graph } from '../../src/graph/store.js';
import { corruptGraph, type CorruptionKind } from '../../src/evaluation/corrupt.js';
import { compareMethods, formatComparison, type CompareOptions, type ComparisonRow, type DetectionMethod } from '../../src/evaluation/compare.js';
import { fit } from '../../src/model/index.js';
import { filteredRanks } from '../../src/scoring/ranking.js';
import { readGraph } from '../../src/sources/index.js';

/**
 * Shared by the detection outside checks: the protocol of DETECTION-NOTES.md — 5% of the triples
 * *added* as errors (originals stay), half replacing the subject and half the object — then each
 * method ranks the corrupted graph and is measured against the planted triples.
 */
export const repoRoot = path.resolve(import.meta.dirname, '../..');
export const datasets = path.resolve(repoRoot, '../shared/datasets');

export async function readDataset(name: 'umls' | 'kinship' | 'nations'): Promise<Graph> {
  return (await readGraph([path.join(datasets, name, 'train.txt')])).graph;
}

export interface DetectionRun {
  rows: ComparisonRow[];
  text: string;
  ap: (method: DetectionMethod) => number;
}

export async function detectionRun(graph: Graph, kind: CorruptionKind, methods: DetectionMethod[], options: Omit<CompareOptions, 'methods' | 'fit' | 'rank'> = {}): Promise<DetectionRun> {
  const { graph: corrupted, injected, firstInjected } = corruptGraph(graph, { rate: 0.05, kinds: [kind], seed: options.seed ?? 1 });
  const kindOf = Array.from({ length: corrupted.size }, (_, i) => (i >= firstInjected ? injected[i - firstInjected]!.kind : null));
  const rows = await compareMethods(corrupted, kindOf, { ...options, methods, fit, rank: (m, g, t) => filteredRanks(m, g, t) });
  const ap = (method: DetectionMethod): number => {
    const row = rows.find((r) => r.method === method);
    if (!row) throw new Error(`no row for ${method}`);
    return row.table.overall.ap;
  };
  return { rows, text: formatComparison(rows), ap };
}

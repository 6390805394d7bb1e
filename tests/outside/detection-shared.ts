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
  /** Average precision of a method per error kind (each kind against the true triples alone). */
  kindAp: (method: DetectionMethod) => Record<string, number>;
}

/**
 * Adds 5% errors of each kind (so each kind, measured against the true triples alone, is at the
 * protocol's 5%), ranks with each method, measures.
 */
export async function detectionRun(graph: Graph, kinds: CorruptionKind[], methods: DetectionMethod[], options: Omit<CompareOptions, 'methods' | 'fit' | 'rank'> = {}): Promise<DetectionRun> {
  const { graph: corrupted, injected, firstInjected } = corruptGraph(graph, { rate: 0.05 * kinds.length, kinds, seed: options.seed ?? 1 });
  const kindOf = Array.from({ length: corrupted.size }, (_, i) => (i >= firstInjected ? injected[i - firstInjected]!.kind : null));
  const rows = await compareMethods(corrupted, kindOf, { ...options, methods, fit, rank: (m, g, t) => filteredRanks(m, g, t) });
  const kindAp = (method: DetectionMethod): Record<string, number> => {
    const row = rows.find((r) => r.method === method);
    if (!row) throw new Error(`no row for ${method}`);
    return Object.fromEntries(Object.entries(row.table.byKind).map(([k, m]) => [k, m.ap]));
  };
  return { rows, text: formatComparison(rows), kindAp };
}

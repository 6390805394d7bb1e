import type { Graph } from '../graph/store.js';
import type { BackendName, ModelConfig } from '../model/types.js';
import type { ProgressSink } from '../progress.js';
import { degreeHeuristic, randomOrder, suspicionFromPlausibility } from '../scoring/baselines.js';
import { crossFit, entityCount, scorableTriples, type FitFunction, type RankFunction, type WarmStart } from '../scoring/crossfit.js';
import { chooseBasis, plausibility, type PlausibilityBasis } from '../scoring/plausibility.js';
import { detectionTable, type DetectionMetrics, type DetectionTable } from './detection.js';
import { fieldToTerm, type TruthEntry } from './corrupt.js';
import { PlumbError } from '../errors.js';

/**
 * Baselines side by side: every method ranks the same corrupted graph's scorable triples (subject and
 * object both resources), and the same metrics measure each against the same truth.
 */
/** As the audit's default (see AUDIT_DEFAULTS in src/audit.ts). */
export const DEFAULT_FOLDS = 3;

export type DetectionMethod = 'random' | 'degree' | 'type-distribution' | 'distmult' | 'rgcn';
export const DETECTION_METHODS: readonly DetectionMethod[] = ['random', 'degree', 'type-distribution', 'distmult', 'rgcn'];

export const METHOD_TITLES: Record<DetectionMethod, string> = {
  random: 'random order',
  degree: 'degree heuristic',
  'type-distribution': 'mined type-distribution check',
  distmult: 'DistMult (out-of-fold)',
  rgcn: 'R-GCN (out-of-fold)',
};

export interface CompareOptions {
  methods?: readonly DetectionMethod[];
  seed?: number;
  folds?: number;
  warmStart?: WarmStart;
  /** Default: `combined` where ranking is affordable, else `logit` (chooseBasis). */
  basis?: PlausibilityBasis;
  /** Model settings shared by both models (the encoder is set per method). */
  model?: Partial<ModelConfig>;
  backend?: BackendName | 'auto';
  /** Time budget per model method (seconds, all folds together). */
  maxSeconds?: number;
  /** Worker threads for the model methods' folds (plumb's own fit only); default 0. */
  workers?: number;
  progress?: ProgressSink;
  fit?: FitFunction;
  rank?: RankFunction;
  /** Suspicion per graph triple from the mined type-distribution check alone; the method is skipped without it. */
  typeDistribution?: (graph: Graph) => Promise<Float64Array>;
}

export interface ComparisonRow {
  method: DetectionMethod;
  title: string;
  seconds: number;
  table: DetectionTable;
}

/** Suspicion per graph triple for one method. */
export async function methodSuspicion(graph: Graph, method: DetectionMethod, options: CompareOptions): Promise<Float64Array | undefined> {
  switch (method) {
    case 'random':
      return randomOrder(graph, options.seed ?? 1);
    case 'degree':
      return degreeHeuristic(graph);
    case 'type-distribution':
      return options.typeDistribution ? options.typeDistribution(graph) : undefined;
    case 'distmult':
    case 'rgcn': {
      if (!options.fit) throw new Error(`method ${method} needs the fit function`);
      const scorable = scorableTriples(graph);
      const basis = options.basis ?? chooseBasis(scorable.reduce((a, b) => a + b, 0), entityCount(graph, scorable));
      const result = await crossFit(graph, {
        folds: options.folds ?? DEFAULT_FOLDS,
        seed: options.seed ?? 1,
        model: { ...options.model, encoder: method === 'rgcn' ? 'rgcn' : 'none' },
        ...(options.backend ? { backend: options.backend } : {}),
        warmStart: options.warmStart ?? 'none',
        ...(options.workers ? { workers: options.workers } : {}),
        ranks: basis !== 'logit',
        ...(options.maxSeconds !== undefined ? { maxSeconds: options.maxSeconds } : {}),
        ...(options.progress ? { progress: options.progress } : {}),
        fit: options.fit,
        ...(options.rank ? { rank: options.rank } : {}),
      });
      const finite = Array.from(result.logit, (v) => Number.isFinite(v));
      const p = plausibility(result, { basis });
      return suspicionFromPlausibility(graph, result.triples, p.map((x, i) => (finite[i] ? x : Number.NaN)));
    }
  }
}

/**
 * Ranks the graph with each method and measures each ranking against `kindOf` (the error kind of
 * each graph triple, null for a true one). Only scorable triples are ranked.
 */
export async function compareMethods(graph: Graph, kindOf: ReadonlyArray<string | null>, options: CompareOptions = {}): Promise<ComparisonRow[]> {
  const scorable = scorableTriples(graph);
  const idx: number[] = [];
  for (let i = 0; i < graph.size; i++) if (scorable[i]) idx.push(i);
  const rows: ComparisonRow[] = [];
  for (const method of options.methods ?? DETECTION_METHODS) {
    const started = performance.now();
    options.progress?.({ phase: 'compare', done: rows.length, total: (options.methods ?? DETECTION_METHODS).length, detail: method });
    const suspicion = await methodSuspicion(graph, method, options);
    if (!suspicion) continue;
    const seconds = (performance.now() - started) / 1000;
    const table = detectionTable(
      idx.map((i) => suspicion[i]!),
      idx.map((i) => kindOf[i] ?? null),
    );
    rows.push({ method, title: METHOD_TITLES[method], seconds, table });
  }
  return rows;
}

const fmt = (x: number): string => (Number.isNaN(x) ? '–' : x.toFixed(3));

/** One plain-text table: a row per method, overall figures, then AP per error kind. */
export function formatComparison(rows: readonly ComparisonRow[]): string {
  const kinds = [...new Set(rows.flatMap((r) => Object.keys(r.table.byKind)))].sort();
  const header = ['method', 'AP', 'ROC-AUC', 'P@K', 'R@1%', ...kinds.map((k) => `AP ${k}`), 'seconds'];
  const body = rows.map((r) => [
    r.title,
    fmt(r.table.overall.ap),
    fmt(r.table.overall.rocAuc),
    fmt(r.table.overall.precisionAtK),
    fmt(r.table.overall.recallAt1pct),
    ...kinds.map((k) => fmt(r.table.byKind[k]?.ap ?? Number.NaN)),
    r.seconds.toFixed(1),
  ]);
  const widths = header.map((h, c) => Math.max(h.length, ...body.map((b) => b[c]!.length)));
  const line = (cells: string[]): string => cells.map((cell, c) => (c === 0 ? cell.padEnd(widths[c]!) : cell.padStart(widths[c]!))).join('  ');
  const first = rows[0]?.table.overall;
  const foot = first ? `\n${first.errors} errors among ${first.total} ranked triples (a random order's AP ≈ ${(first.errors / Math.max(1, first.total)).toFixed(3)}).` : '';
  return `${[line(header), line(widths.map((w) => '-'.repeat(w))), ...body.map(line)].join('\n')}${foot}\n`;
}

/** The figures of one row as plain data (for `--json`). */
export function comparisonJson(rows: readonly ComparisonRow[]): Array<{ method: DetectionMethod; seconds: number } & DetectionMetrics & { byKind: Record<string, DetectionMetrics> }> {
  return rows.map((r) => ({ method: r.method, seconds: r.seconds, ...r.table.overall, byKind: r.table.byKind }));
}

/** One row of an audit's `scores.tsv`: a scored triple's place in the ranking. */
export interface RankedTriple {
  order: number;
  /** `subject\tpredicate\tobject` as term keys. */
  key: string;
  plausibility: number;
}

/** Reads `scores.tsv` as written by the audit (see `scoresText` in src/audit.ts). */
export function parseScores(text: string, file: string): RankedTriple[] {
  const out: RankedTriple[] = [];
  const lines = text.split(/\r?\n/);
  lines.forEach((line, i) => {
    if (line.trim() === '' || (i === 0 && line.startsWith('order\t'))) return;
    const c = line.split('\t');
    const order = Number(c[0]);
    if (c.length < 6 || !Number.isFinite(order)) {
      throw new PlumbError('E_PARSE', 'expected a scores row: order, subject, predicate, object, graph, plausibility, …', {
        position: { file, line: i + 1 },
        hint: 'pass the scores.tsv an audit wrote beside its report.json',
      });
    }
    out.push({ order, key: `${fieldToTerm(c[1]!)}\t${fieldToTerm(c[2]!)}\t${fieldToTerm(c[3]!)}`, plausibility: c[5] === '' ? Number.NaN : Number(c[5]) });
  });
  return out;
}

export interface RankingEvaluation {
  table: DetectionTable;
  /** Truth triples that the ranking does not hold (counted as ranked last). */
  unranked: number;
}

/**
 * Measures an audit's ranking against a truth file: every ranked triple is an item, ordered by its
 * place in the ranking; a truth triple the audit did not rank still counts, tied at the bottom.
 */
export function evaluateRanking(ranking: readonly RankedTriple[], truth: readonly TruthEntry[]): RankingEvaluation {
  const kindOf = new Map<string, string>();
  for (const t of truth) kindOf.set(`${t.subject}\t${t.predicate}\t${t.object}`, t.kind);
  const suspicion: number[] = [];
  const kinds: Array<string | null> = [];
  const seen = new Set<string>();
  for (const r of ranking) {
    suspicion.push(-r.order);
    const kind = kindOf.get(r.key);
    kinds.push(kind ?? null);
    if (kind !== undefined) seen.add(r.key);
  }
  let unranked = 0;
  for (const [key, kind] of kindOf) {
    if (seen.has(key)) continue;
    unranked++;
    suspicion.push(Number.NEGATIVE_INFINITY);
    kinds.push(kind);
  }
  return { table: detectionTable(suspicion, kinds), unranked };
}

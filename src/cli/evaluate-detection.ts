import type { Command } from 'commander';
import { PlumbError } from '../errors.js';
import { comparisonJson, DEFAULT_FOLDS, DETECTION_METHODS, formatComparison, type DetectionMethod } from '../evaluation/compare.js';
import type { DetectionMetrics, DetectionTable } from '../evaluation/detection.js';
import type { CliIO } from './io.js';
import { inputPaths, toReadOptions } from './read-options.js';
import { parseNumber } from './corrupt.js';

/**
 * The detection half of `plumb evaluate`: how well a ranking puts known errors first.
 * - `--truth <file> --report <report.json>`: measures an audit's ranking (the `scores.tsv` written beside
 *   the report) against a truth file from `plumb corrupt`;
 * - `--truth <file> --baselines <graph…>`: ranks the (corrupted) graph with each method and prints one table.
 * `src/cli/evaluate.ts` adds the options with {@link addDetectionOptions} and calls
 * {@link runDetectionEvaluation} first; it returns false when no detection option was given.
 */

export function addDetectionOptions(command: Command): Command {
  return command
    .option('--truth <file>', 'detection: a truth file from `plumb corrupt` (the injected triples and their kinds)')
    .option('--report <file>', 'detection: an audit report.json; its ranking is read from scores.tsv beside it')
    .option('--baselines <file>', 'detection: rank this graph file with each method and compare (repeatable)', (v: string, prev: string[] = []) => [...prev, v])
    .option('--methods <list>', `detection with --baselines: methods to compare (${DETECTION_METHODS.join(', ')})`, DETECTION_METHODS.join(','))
    .option('--folds <k>', 'detection with --baselines: folds for the out-of-fold models', String(DEFAULT_FOLDS))
    .option('--time-budget <seconds>', 'detection with --baselines: seconds per model method, all folds together');
}

interface DetectionOptions {
  truth?: string;
  report?: string;
  baselines?: string[];
  methods?: string;
  folds?: string;
  timeBudget?: string;
  json?: boolean;
  seed?: string;
}

const fmt = (x: number): string => (Number.isNaN(x) ? '–' : x.toFixed(3));

function metricsJson(m: DetectionMetrics): Record<string, number | null> {
  const n = (x: number): number | null => (Number.isNaN(x) ? null : Number(x.toFixed(6)));
  return { ap: n(m.ap), rocAuc: n(m.rocAuc), precisionAtK: n(m.precisionAtK), recallAt1pct: n(m.recallAt1pct), errors: m.errors, total: m.total };
}

/** The detection figures as one plain table: overall, then per error kind. */
export function formatDetection(table: DetectionTable, unranked: number): string {
  const rows: string[][] = [['', 'errors', 'AP', 'ROC-AUC', 'P@K', 'R@1%']];
  const add = (name: string, m: DetectionMetrics): void => {
    rows.push([name, String(m.errors), fmt(m.ap), fmt(m.rocAuc), fmt(m.precisionAtK), fmt(m.recallAt1pct)]);
  };
  add('all', table.overall);
  for (const [kind, m] of Object.entries(table.byKind)) add(kind, m);
  const widths = rows[0]!.map((_, c) => Math.max(...rows.map((r) => r[c]!.length)));
  const lines = rows.map((r) => r.map((cell, c) => (c === 0 ? cell.padEnd(widths[c]!) : cell.padStart(widths[c]!))).join('  '));
  const share = table.overall.total === 0 ? 0 : table.overall.errors / table.overall.total;
  lines.push(`${table.overall.total} ranked triples; a random order's AP ≈ ${share.toFixed(3)}, ROC-AUC 0.5.`);
  if (unranked > 0) lines.push(`${unranked} truth triples were not ranked by the audit (counted as ranked last).`);
  return `${lines.join('\n')}\n`;
}

function parseMethods(value: string): DetectionMethod[] {
  const names = value.split(',').map((m) => m.trim()).filter(Boolean);
  for (const m of names) {
    if (!(DETECTION_METHODS as readonly string[]).includes(m)) throw new PlumbError('E_USAGE', `unknown method "${m}"`, { hint: `choose from ${DETECTION_METHODS.join(', ')}` });
  }
  return names as DetectionMethod[];
}

/** Runs the detection mode when its options are present; returns false otherwise (link prediction then). */
export async function runDetectionEvaluation(options: Record<string, unknown>, io: CliIO): Promise<boolean> {
  const o = options as DetectionOptions;
  if (o.truth === undefined && o.report === undefined && o.baselines === undefined) return false;
  if (o.truth === undefined) throw new PlumbError('E_USAGE', '--report and --baselines need --truth <file>', { hint: 'write a truth file with `plumb corrupt --truth <file>`' });
  if ((o.report === undefined) === (o.baselines === undefined)) {
    throw new PlumbError('E_USAGE', 'give either --report <report.json> or --baselines <graph file> with --truth', {
      hint: '`--report` measures an audit you ran; `--baselines` ranks the graph with each method and compares them',
    });
  }
  // Loaded on use: the model modules bring TensorFlow.js, which other commands do not need.
  const { compareBaselines, evaluateAuditRanking, readTruth } = await import('../evaluate.js');
  const truth = await readTruth(inputPaths([o.truth], io)[0]!);

  if (o.report !== undefined) {
    const { table, unranked } = await evaluateAuditRanking(inputPaths([o.report], io)[0]!, truth);
    if (o.json) io.stdout.write(`${JSON.stringify({ ...metricsJson(table.overall), unranked, byKind: Object.fromEntries(Object.entries(table.byKind).map(([k, m]) => [k, metricsJson(m)])) }, null, 2)}\n`);
    else io.stdout.write(formatDetection(table, unranked));
    return true;
  }

  const { rows, missing } = await compareBaselines(inputPaths(o.baselines ?? [], io), truth, {
    methods: parseMethods(o.methods ?? DETECTION_METHODS.join(',')),
    folds: parseNumber('--folds', o.folds ?? String(DEFAULT_FOLDS), (x) => Number.isInteger(x) && x >= 2 && x <= 100, 'give a whole number from 2 to 100'),
    seed: o.seed === undefined ? 1 : parseNumber('--seed', o.seed, (x) => Number.isInteger(x) && x >= 0, 'give a whole number'),
    read: toReadOptions(options, io),
    ...(o.timeBudget !== undefined ? { maxSeconds: parseNumber('--time-budget', o.timeBudget, (x) => x > 0, 'give seconds, e.g. --time-budget 300') } : {}),
  });
  if (o.json) io.stdout.write(`${JSON.stringify({ missing, methods: comparisonJson(rows) }, null, 2)}\n`);
  else {
    io.stdout.write(formatComparison(rows));
    if (missing > 0) io.stdout.write(`${missing} truth triples are not in the graph and were left out.\n`);
  }
  return true;
}

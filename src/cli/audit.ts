import { mkdir } from 'node:fs/promises';
import { join } from 'node:path';
import { Command, Option } from 'commander';
import { AUDIT_DEFAULTS, auditDetailed, scoresText, SCORES_FILE, type AuditRun, type AuditRunOptions } from '../audit.js';
import { CHECK_IDS } from '../checks/index.js';
import { PlumbError, usageError } from '../errors.js';
import type { ModelConfig } from '../model/types.js';
import { createProgressSink, formatTerminalSummary, parseFormats, writeFileAtomic, writeReports } from '../report/index.js';
import { PLAUSIBILITY_BASES, type PlausibilityBasis } from '../scoring/plausibility.js';
import type { RegisterCommand } from './commands.js';
import { isInteractive, type CliIO } from './io.js';
import { addReadOptions, inputPaths, toReadOptions } from './read-options.js';

interface AuditFlags {
  schema?: string[];
  shapes?: string[];
  model?: string;
  folds: string;
  out: string;
  format: string;
  top: string;
  threshold: string;
  seed: string;
  calibrate?: boolean;
  checks: boolean;
  closedWorld?: boolean;
  skip?: string[];
  basis: PlausibilityBasis | 'auto';
  warmStart: 'none' | 'half';
  encoder?: 'rgcn' | 'none';
  dim?: string;
  layers?: string;
  epochs?: string;
  patience?: string;
  batchSize?: string;
  learningRate?: string;
  l2?: string;
  negatives?: string;
  backend?: 'auto' | 'wasm' | 'cpu' | 'tensorflow';
  timeBudget?: string;
  summaryTop?: string;
  inputFormat?: string;
  workers?: string;
}

/**
 * The shared reading flags, except that `--format` names the report formats here (as for every
 * command that writes reports), so the input format is `--input-format`.
 */
export function addAuditReadOptions(command: Command): void {
  const scratch = addReadOptions(new Command('scratch'));
  for (const option of scratch.options) {
    if (option.long === '--format') command.option('--input-format <format>', option.description);
    else command.addOption(option);
  }
}

const HELP = `
How suspects are found: the triples are split into --folds parts; for each part a model is fitted on
the rest with that part hidden from training and from message passing, and scores the hidden part.
So every triple is scored by a model that never saw it. A triple's plausibility is the share of the
other triples of its predicate that the model scored lower (0 = the worst of its predicate, 1 = the
best), pulled towards the whole graph for predicates with few triples. Triples below --threshold are
suspects; the --top least plausible are listed, each with the entities the model prefers in its place,
its types against the predicate's usual types, and the degrees of its subject and object.
${SCORES_FILE} beside the report lists every scored triple with its plausibility.

The trust figure (--calibrate, on by default below ${AUDIT_DEFAULTS.calibrateUpTo.toLocaleString('en-US')} triples): errors of each kind are planted in
a copy of the graph, the copy is scored the same way, and the report says how many came first. The
planted triples never appear among the findings.

Checks: ${CHECK_IDS.join(', ')}.

Examples:
  plumb audit graph.ttl --schema ontology.ttl --out reports --format json,html
  plumb audit data.nt --folds 3 --top 50 --time-budget 600`;

function integer(name: string, value: string, low: number, high: number): number {
  const n = Number(value);
  if (!Number.isInteger(n) || n < low || n > high) throw usageError(`${name} must be a whole number from ${low} to ${high}, not "${value}"`);
  return n;
}

function number(name: string, value: string, check: (x: number) => boolean, hint: string): number {
  const n = Number(value);
  if (value.trim() === '' || !Number.isFinite(n) || !check(n)) throw usageError(`${name} is out of range: "${value}"`, hint);
  return n;
}

const list = (value: string, previous: string[] | undefined): string[] => [...(previous ?? []), ...value.split(',').map((s) => s.trim()).filter(Boolean)];

/** Model settings given on the command line (the rest keep the model's defaults). */
export function modelFlags(flags: Partial<AuditFlags>): Partial<ModelConfig> {
  const out: Partial<ModelConfig> = {};
  if (flags.encoder) out.encoder = flags.encoder;
  if (flags.dim !== undefined) out.dim = integer('--dim', flags.dim, 1, 4096);
  if (flags.layers !== undefined) out.layers = integer('--layers', flags.layers, 1, 8);
  if (flags.epochs !== undefined) out.epochs = integer('--epochs', flags.epochs, 1, 100_000);
  if (flags.patience !== undefined) out.patience = integer('--patience', flags.patience, 1, 100_000);
  if (flags.batchSize !== undefined) out.batchSize = integer('--batch-size', flags.batchSize, 1, 10_000_000);
  if (flags.negatives !== undefined) out.negatives = integer('--negatives', flags.negatives, 1, 1000);
  if (flags.learningRate !== undefined) out.learningRate = number('--learning-rate', flags.learningRate, (x) => x > 0 && x <= 10, 'for example --learning-rate 0.01');
  if (flags.l2 !== undefined) out.l2 = number('--l2', flags.l2, (x) => x >= 0 && x <= 100, 'for example --l2 0.01');
  return out;
}

/** Flags to options of {@link auditDetailed}. */
export function auditOptions(flags: AuditFlags, io: CliIO): AuditRunOptions {
  const options: AuditRunOptions = {
    folds: integer('--folds', flags.folds, 2, 100),
    top: integer('--top', flags.top, 0, 10_000_000),
    threshold: number('--threshold', flags.threshold, (x) => x >= 0 && x <= 1, 'a plausibility in [0, 1], e.g. --threshold 0.02'),
    seed: integer('--seed', flags.seed, 0, 2 ** 31 - 1),
    basis: flags.basis,
    warmStart: flags.warmStart,
    checks: flags.checks,
    read: toReadOptions({ ...(flags as unknown as Record<string, unknown>), format: flags.inputFormat }, io),
  };
  const model = modelFlags(flags);
  if (Object.keys(model).length > 0) options.model = model;
  if (flags.schema) options.schema = flags.schema;
  if (flags.shapes) options.shapes = flags.shapes;
  if (flags.model !== undefined) options.modelDir = flags.model;
  if (flags.calibrate !== undefined) options.calibrate = flags.calibrate;
  if (flags.backend) options.backend = flags.backend;
  if (flags.timeBudget !== undefined) options.maxSeconds = number('--time-budget', flags.timeBudget, (x) => x >= 0, 'seconds for all fold fits, e.g. --time-budget 600, or 0 for no limit');
  if (flags.workers !== undefined) options.workers = integer('--workers', flags.workers, 0, 64);
  if (flags.closedWorld || flags.skip) options.checkOptions = { ...(flags.closedWorld ? { closedWorld: true } : {}), ...(flags.skip ? { skip: flags.skip } : {}) };
  return options;
}

/** Writes the reports and the scores table into the --out folder; returns the paths written. */
export async function writeAuditOutputs(run: AuditRun, outDir: string, formats: string): Promise<string[]> {
  const written = await writeReports(run.report, outDir, parseFormats(formats));
  if (run.scores) {
    await mkdir(outDir, { recursive: true });
    const path = join(outDir, SCORES_FILE);
    try {
      await writeFileAtomic(path, scoresText(run));
    } catch (error) {
      throw new PlumbError('E_INPUT', `cannot write ${path}: ${(error as Error).message}`, { hint: 'check that the --out folder is writable', cause: error });
    }
    written.push(path);
  }
  return written;
}

/** An output path relative to the CLI's working directory. */
export function outPath(path: string, io: CliIO): string {
  return inputPaths([path], io)[0]!;
}

export const registerAudit: RegisterCommand = (program, { io, setExitCode }) => {
  const command: Command = program
    .command('audit')
    .summary('check, fit a model out-of-fold, and rank every triple: the main job')
    .description(
      'Audit a graph: run the schema, SHACL and mined checks, score every triple with a relational model\n' +
        'that never saw it (out-of-fold), and write one ranked list of violations and suspects.',
    )
    .argument('<files...>', 'graph files (N-Triples, N-Quads, Turtle, TriG, CSV/TSV, optionally .gz; - for stdin)')
    .option('--schema <files...>', 'ontology files whose RDFS/OWL axioms apply besides those in the graph')
    .option('--shapes <files...>', 'SHACL shapes files')
    .option('--model <dir>', 'score with a model saved by `plumb fit --save` instead of fitting (triples it trained on are then scored in-sample)')
    .option('--folds <k>', 'folds for out-of-fold scoring', String(AUDIT_DEFAULTS.folds))
    .option('--out <dir>', 'folder for the reports', 'reports')
    .option('--format <list>', 'report formats, comma-separated: json, html, sarif, junit, markdown, or all', 'json')
    .option('--top <n>', 'suspects listed at most (every triple is still scored)', String(AUDIT_DEFAULTS.top))
    .option('--threshold <p>', 'plausibility below which a triple is a suspect', String(AUDIT_DEFAULTS.threshold))
    .option('--seed <n>', 'seed for folds, training and the trust figure', String(AUDIT_DEFAULTS.seed))
    .option('--calibrate', 'measure the ranking on errors planted in a copy (default: on for small graphs)')
    .option('--no-calibrate', 'skip the trust figure')
    .option('--no-checks', 'skip the schema and mined checks (model only)')
    .option('--closed-world', 'checks: read a missing type as an error')
    .option('--skip <checks>', 'checks: skip these (comma-separated ids)', list)
    .addOption(new Option('--basis <basis>', 'what plausibility calibrates per predicate: logit, rank, combined, or auto (combined where ranking every triple is affordable)').choices([...PLAUSIBILITY_BASES, 'auto']).default(AUDIT_DEFAULTS.basis))
    .addOption(new Option('--warm-start <mode>', 'fold models start from a model that hid their half (half) or from scratch').choices(['none', 'half']).default(AUDIT_DEFAULTS.warmStart))
    .addOption(new Option('--encoder <encoder>', 'rgcn (R-GCN encoder) or none (plain DistMult)').choices(['rgcn', 'none']))
    .option('--dim <n>', 'embedding width')
    .option('--layers <n>', 'R-GCN layers')
    .option('--epochs <n>', 'most epochs per fold model')
    .option('--patience <n>', 'validations without a better filtered MRR before a fold model stops')
    .option('--batch-size <n>', 'positive triples per training step')
    .option('--learning-rate <x>', 'Adam learning rate')
    .option('--l2 <x>', 'L2 weight on the decoder inputs')
    .option('--negatives <n>', 'negative samples per positive')
    .addOption(new Option('--backend <backend>', 'TensorFlow.js backend').choices(['auto', 'tensorflow', 'wasm', 'cpu']))
    .option('--time-budget <seconds>', `wall-clock seconds for all fold fits together, 0 for no limit (default ${AUDIT_DEFAULTS.timeBudget})`)
    .option('--workers <n>', 'worker threads fitting folds side by side (default: one per core, at most one per fold; 0: none)')
    .option('--summary-top <n>', 'findings listed in the terminal summary (default 10)');
  addAuditReadOptions(command);
  command.addHelpText('after', HELP);
  command.action(async (files: string[], flags: AuditFlags) => {
    const options = auditOptions(flags, io);
    // Validate the formats before the long run.
    parseFormats(flags.format);
    const progress = createProgressSink(io);
    let run: AuditRun;
    try {
      run = await auditDetailed(inputPaths(files, io), { ...options, progress: progress.sink });
    } finally {
      progress.stop();
    }
    const started = performance.now();
    const written = await writeAuditOutputs(run, outPath(flags.out, io), flags.format);
    run.report.durations.report = Math.round(performance.now() - started) / 1000;
    const summaryTop = flags.summaryTop === undefined ? undefined : integer('--summary-top', flags.summaryTop, 0, 10_000);
    io.stdout.write(formatTerminalSummary(run.report, { color: isInteractive(io), ...(summaryTop !== undefined ? { top: summaryTop } : {}) }));
    io.stderr.write(`plumb: wrote ${written.join(', ')}\n`);
    setExitCode(0);
  });
};

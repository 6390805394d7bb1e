import type { Command } from 'commander';
import { loadConfig, applyConfig, type ConfigKey } from '../config.js';
import { usageError } from '../errors.js';
import { gate, type GateRunOptions } from '../gate-run.js';
import { createProgressSink, formatTerminalSummary, parseFormats, writeReports } from '../report/index.js';
import type { RegisterCommand } from './commands.js';
import { isInteractive } from './io.js';
import { inputPaths, toReadOptions } from './read-options.js';
import { addAuditReadOptions, modelFlags, outPath } from './audit.js';

interface GateFlags {
  base?: string[];
  schema?: string[];
  shapes?: string[];
  model?: string;
  maxErrors?: string | number;
  maxWarnings?: string | number;
  maxSuspects?: string | number;
  minPlausibility?: string | number;
  suppressions?: string;
  out: string;
  format: string | string[];
  seed: string | number;
  folds?: string | number;
  config?: string;
  encoder?: 'rgcn' | 'none';
  dim?: string;
  layers?: string;
  epochs?: string;
  inputFormat?: string;
}

const CONFIG_KEYS_OF_GATE: readonly ConfigKey[] = [
  'base', 'schema', 'shapes', 'model', 'maxErrors', 'maxWarnings', 'maxSuspects', 'minPlausibility', 'suppressions', 'out', 'format', 'seed', 'folds',
];

const HELP = `
The gate audits only the incoming triples, in the context of the base graph plus the incoming ones.
Incoming triples already in the base are not audited. With --model (a folder written by
\`plumb fit --save\` on the base graph) nothing is refitted and the incoming triples, which that model
never saw, are scored directly; without it, fold models are fitted with the incoming triples hidden.

It exits 1 when a threshold is crossed: by default any finding of severity error (--max-errors 0);
--max-warnings, --max-suspects and --min-plausibility add limits. A suppressions file lists accepted
findings as JSON: [{"subject": …, "predicate": …, "object": …, "check": …, "reason": …,
"expires": "YYYY-MM-DD"}]; an expired entry brings its finding back with a note.

Options may also come from plumb.config.json in the working folder (or --config <file>); its keys are
the long flags in camelCase (maxErrors, minPlausibility, …) and a flag on the command line wins.

Exit codes: 0 passed, 1 a threshold was crossed, 2 bad usage or unreadable input, 3 an internal fault.

Example:
  plumb gate changes.ttl --base graph.ttl --model models/current --max-suspects 5 --out reports/gate`;

function whole(name: string, value: string | number): number {
  const n = Number(value);
  if (!Number.isInteger(n) || n < 0) throw usageError(`${name} must be a whole number of 0 or more, not "${value}"`);
  return n;
}

export const registerGate: RegisterCommand = (program, { io, setExitCode }) => {
  const command: Command = program
    .command('gate')
    .summary('CI: audit only the incoming triples against the base graph; exit 1 when thresholds are crossed')
    .description('Audit the incoming triples of a change against the base graph (and a saved model), for a merge gate.')
    .argument('<incoming...>', 'files of incoming triples')
    .option('--base <files...>', 'the graph the incoming triples are merged into (required, here or in plumb.config.json)')
    .option('--schema <files...>', 'ontology files whose RDFS/OWL axioms apply')
    .option('--shapes <files...>', 'SHACL shapes files')
    .option('--model <dir>', 'a model saved by `plumb fit --save` on the base graph: no refit')
    .option('--max-errors <n>', 'most findings of severity error allowed (default 0)')
    .option('--max-warnings <n>', 'most findings of severity warning allowed')
    .option('--max-suspects <n>', 'most suspects allowed')
    .option('--min-plausibility <p>', 'every scored incoming triple must be at least this plausible, in [0, 1]')
    .option('--suppressions <file>', 'JSON file of accepted findings, each with a reason and an optional expiry date')
    .option('--out <dir>', 'folder for the reports', 'reports/gate')
    .option('--format <list>', 'report formats, comma-separated: json, html, sarif, junit, markdown, or all', 'json,sarif,junit,markdown')
    .option('--folds <k>', 'without --model: folds over the incoming triples', '2')
    .option('--seed <n>', 'seed for fitting without --model', '1')
    .option('--no-model', 'checks only: do not score the incoming triples with a model')
    .option('--encoder <encoder>', 'without --model: rgcn or none (plain DistMult)')
    .option('--dim <n>', 'without --model: embedding width')
    .option('--layers <n>', 'without --model: R-GCN layers')
    .option('--epochs <n>', 'without --model: most epochs per fold model')
    .option('--config <file>', 'read options from this file instead of ./plumb.config.json');
  addAuditReadOptions(command);
  command.addHelpText('after', HELP);
  command.action(async (files: string[], raw: GateFlags) => {
    const config = await loadConfig(raw.config, io.cwd);
    const flags = applyConfig(raw, config, CONFIG_KEYS_OF_GATE, (key) => command.getOptionValueSource(key) === 'cli');
    if (!flags.base || flags.base.length === 0) throw usageError('the gate needs the base graph', 'name it with --base <files...> or "base" in plumb.config.json');
    const formats = parseFormats(flags.format);
    const thresholds: GateRunOptions['thresholds'] = {};
    if (flags.maxErrors !== undefined) thresholds.maxErrors = whole('--max-errors', flags.maxErrors);
    if (flags.maxWarnings !== undefined) thresholds.maxWarnings = whole('--max-warnings', flags.maxWarnings);
    if (flags.maxSuspects !== undefined) thresholds.maxSuspects = whole('--max-suspects', flags.maxSuspects);
    if (flags.minPlausibility !== undefined) {
      const p = Number(flags.minPlausibility);
      if (!(p >= 0 && p <= 1)) throw usageError(`--min-plausibility must be in [0, 1], not "${flags.minPlausibility}"`);
      thresholds.minPlausibility = p;
    }
    // commander turns --no-model into model: false; a string is a model folder.
    const modelValue = flags.model as string | boolean | undefined;
    const options: GateRunOptions = {
      base: inputPaths(flags.base, io),
      thresholds,
      read: toReadOptions({ ...(flags as unknown as Record<string, unknown>), format: flags.inputFormat }, io),
      seed: whole('--seed', flags.seed),
      folds: whole('--folds', flags.folds ?? 2),
    };
    if (flags.schema) options.schema = inputPaths(flags.schema, io);
    if (flags.shapes) options.shapes = inputPaths(flags.shapes, io);
    // Paths from the command line are relative to the CLI's working folder (config paths are absolute already).
    if (typeof modelValue === 'string') options.modelDir = outPath(modelValue, io);
    if (modelValue === false) options.noModel = true;
    if (flags.suppressions !== undefined) options.suppressions = outPath(flags.suppressions, io);
    const model = modelFlags({
      ...(flags.encoder ? { encoder: flags.encoder } : {}),
      ...(flags.dim !== undefined ? { dim: flags.dim } : {}),
      ...(flags.layers !== undefined ? { layers: flags.layers } : {}),
      ...(flags.epochs !== undefined ? { epochs: flags.epochs } : {}),
    });
    if (Object.keys(model).length > 0) options.model = model;
    const progress = createProgressSink(io);
    let run;
    try {
      run = await gate(inputPaths(files, io), { ...options, progress: progress.sink });
    } finally {
      progress.stop();
    }
    const written = await writeReports(run.report, outPath(flags.out, io), formats);
    // The summary ends with the gate's outcome and the thresholds crossed.
    io.stdout.write(formatTerminalSummary(run.report, { color: isInteractive(io) }));
    const expired = run.report.gate?.expiredSuppressions ?? 0;
    if (expired > 0) {
      io.stdout.write(`note: ${expired} suppression${expired === 1 ? ' has' : 's have'} expired, so ${expired === 1 ? 'its finding counts' : 'their findings count'} again (the reports say when and why it was accepted)\n`);
    }
    io.stderr.write(`plumb: wrote ${written.join(', ')}\n`);
    setExitCode(run.exitCode);
  });
};

import { Option, type Command } from 'commander';
import { usageError } from '../errors.js';
import type { Graph } from '../graph/store.js';
import { DEFAULT_MODEL_CONFIG } from '../model/config.js';
import type { BackendName, FitOptions, ModelConfig, TrainedModel } from '../model/types.js';
import { createProgressSink } from '../report/index.js';
import { readGraph } from '../sources/index.js';
import type { RegisterCommand } from './commands.js';
import type { CliIO } from './io.js';
import { addReadOptions, inputPaths, toReadOptions } from './read-options.js';

/** `plumb fit <files…> --save <dir>`: train a model on a graph and save it for later audits and gates. */

type Kind = 'integer' | 'number' | 'choice';

/** One row per model setting: the flag, the config key it sets, how it parses. `--help` comes from here. */
const MODEL_FLAGS: { flag: string; key: keyof ModelConfig; kind: Kind; help: string; choices?: readonly string[]; low?: number; high?: number }[] = [
  { flag: 'encoder', key: 'encoder', kind: 'choice', choices: ['rgcn', 'none'], help: 'rgcn: R-GCN layers feed the DistMult decoder; none: plain DistMult' },
  { flag: 'dim', key: 'dim', kind: 'integer', low: 1, high: 4096, help: 'embedding width' },
  { flag: 'layers', key: 'layers', kind: 'integer', low: 1, high: 8, help: 'R-GCN layers' },
  { flag: 'decomposition', key: 'decomposition', kind: 'choice', choices: ['none', 'basis', 'block'], help: 'how each relation weight W_r is parameterised' },
  { flag: 'bases', key: 'bases', kind: 'integer', low: 1, high: 1024, help: 'basis matrices (--decomposition basis)' },
  { flag: 'blocks', key: 'blocks', kind: 'integer', low: 1, high: 4096, help: 'diagonal blocks (--decomposition block; must divide --dim; default 10, or the divisor of --dim nearest dim/10)' },
  { flag: 'dropout', key: 'dropout', kind: 'number', low: 0, high: 0.95, help: 'feature dropout on each layer input while training' },
  { flag: 'edge-dropout', key: 'edgeDropout', kind: 'number', low: 0, high: 0.95, help: 'share of triples left out of message passing at each step' },
  { flag: 'negatives', key: 'negatives', kind: 'integer', low: 1, high: 1000, help: 'corrupted triples per positive' },
  { flag: 'sampling', key: 'sampling', kind: 'choice', choices: ['uniform', 'typed'], help: 'replacements from all entities, or from those seen in that position of that predicate' },
  { flag: 'epochs', key: 'epochs', kind: 'integer', low: 1, high: 100_000, help: 'most passes over the training triples' },
  { flag: 'batch-size', key: 'batchSize', kind: 'integer', low: 0, high: 10_000_000, help: 'positive triples per step; 0: an eighth of the training triples, within 128–32,768' },
  { flag: 'lr', key: 'learningRate', kind: 'number', low: 1e-6, high: 10, help: 'Adam learning rate' },
  { flag: 'l2', key: 'l2', kind: 'number', low: 0, high: 100, help: 'L2 weight on the decoder inputs' },
  { flag: 'patience', key: 'patience', kind: 'integer', low: 1, high: 100_000, help: 'epochs without a better validation MRR before stopping' },
  { flag: 'seed', key: 'seed', kind: 'integer', low: 0, high: 2 ** 31 - 1, help: 'seed of every random draw (repeatable on one backend)' },
];

const camel = (flag: string): string => flag.replace(/-([a-z])/g, (_, c: string) => c.toUpperCase());

/** Adds the model settings as flags (shared by commands that fit models). */
export function addModelOptions(command: Command): Command {
  for (const row of MODEL_FLAGS) {
    const def = String(DEFAULT_MODEL_CONFIG[row.key]);
    const option = new Option(`--${row.flag} <${row.kind === 'choice' ? 'name' : 'n'}>`, `${row.help} (default ${def})`);
    command.addOption(row.choices ? option.choices(row.choices) : option);
  }
  return command;
}

/** The model settings given as flags, checked; settings not given keep their defaults. */
export function modelOptions(flags: Record<string, unknown>): Partial<ModelConfig> {
  const out: Record<string, unknown> = {};
  for (const row of MODEL_FLAGS) {
    const raw = flags[camel(row.flag)];
    if (raw === undefined) continue;
    if (row.kind === 'choice') {
      out[row.key] = raw;
      continue;
    }
    const text = String(raw);
    const value = Number(text);
    const ok = text.trim() !== '' && Number.isFinite(value) && (row.kind === 'number' || Number.isInteger(value)) && value >= row.low! && value <= row.high!;
    if (!ok) {
      throw usageError(`--${row.flag} must be ${row.kind === 'integer' ? 'a whole number' : 'a number'} from ${row.low} to ${row.high}, not "${text}"`, `for example --${row.flag} ${String(DEFAULT_MODEL_CONFIG[row.key])}`);
    }
    out[row.key] = value;
  }
  return out as Partial<ModelConfig>;
}

export function addBackendOption(command: Command): Command {
  return command.addOption(
    new Option('--backend <name>', 'TensorFlow.js backend: auto (native where installed, else WebAssembly), wasm, cpu or tensorflow').choices(['auto', 'wasm', 'cpu', 'tensorflow']).default('auto'),
  );
}

const HELP = `
The model is an R-GCN encoder (Schlichtkrull et al. 2018) with a DistMult decoder, trained with
negative sampling; --encoder none trains plain DistMult. Triples whose object is a literal are not
modelled. Training stops early when the filtered MRR on the validation triples (--valid, or else a
held-out share of the graph) stops improving. The backend in use is printed on stderr.

Examples:
  plumb fit graph.nt --save models/graph
  plumb fit train.txt --valid valid.txt --save models/umls --epochs 200
  plumb fit graph.ttl --save models/g --encoder none --dim 200 --max-seconds 600`;

export const registerFit: RegisterCommand = (program: Command, { io, setExitCode }) => {
  const command = program
    .command('fit')
    .description('train a relational model (R-GCN + DistMult) on a graph and save it for later audits and gates')
    .argument('<files...>', 'graph files to train on (N-Triples, N-Quads, Turtle, TriG, CSV, TSV; .gz too), or - for standard input')
    .requiredOption('--save <dir>', 'directory to write the model to (replaced atomically)')
    .option('--valid <file>', 'validation triples for early stopping (default: a held-out share of the graph)', (v: string, prev: string[] = []) => [...prev, v])
    .option('--max-seconds <n>', 'stop training after this many seconds, keeping the best weights so far')
    .option('--json', 'print a summary of the fitted model as JSON on stdout');
  addModelOptions(command);
  addBackendOption(command);
  addReadOptions(command);
  command.addHelpText('after', HELP);
  command.action(async (files: string[], flags: Record<string, unknown>) => {
    const model = await fitFromFiles(files, flags, io);
    try {
      await model.trained.save(inputPaths([String(flags.save)], io)[0]!);
      const summary = fitSummary(model.trained, model.graph, model.seconds);
      if (flags.json === true) io.stdout.write(`${JSON.stringify({ ...summary, saved: String(flags.save) }, null, 2)}\n`);
      else io.stdout.write(`${fitText(summary)}saved to ${String(flags.save)}\n`);
    } finally {
      model.trained.dispose();
    }
    setExitCode(0);
  });
};

async function fitFromFiles(files: string[], flags: Record<string, unknown>, io: CliIO): Promise<{ trained: TrainedModel; graph: Graph; seconds: number }> {
  const config = modelOptions(flags);
  const validFiles = (flags.valid as string[] | undefined) ?? [];
  const paths = inputPaths([...files, ...validFiles], io);
  const progress = createProgressSink(io);
  try {
    const read = await readGraph(paths, { ...toReadOptions(flags, io), progress: progress.sink });
    const graph = read.graph;
    const options: FitOptions = { ...config, progress: progress.sink, backend: (flags.backend as BackendName | 'auto' | undefined) ?? 'auto' };
    if (validFiles.length > 0) {
      // Validation files were read last: their triples are those whose file index comes after the graph's.
      const valid: number[] = [];
      for (let t = 0; t < graph.size; t++) if (graph.provenance.file[t]! >= files.length) valid.push(t);
      if (valid.length === 0) throw usageError(`the validation file(s) ${validFiles.join(', ')} hold no triple that is not already in the graph`);
      options.valid = Int32Array.from(valid);
    }
    if (flags.maxSeconds !== undefined) {
      const seconds = Number(flags.maxSeconds);
      if (!Number.isFinite(seconds) || seconds <= 0) throw usageError(`--max-seconds must be a positive number, not "${String(flags.maxSeconds)}"`);
      options.maxSeconds = seconds;
    }
    const { fit, initBackend } = await import('../model/index.js');
    const backend = await initBackend(options.backend ?? 'auto', graph.terms.size);
    io.stderr.write(`plumb: model backend ${backend}${backend === 'wasm' ? ' (WebAssembly, one core)' : ''}\n`);
    const started = performance.now();
    const trained = await fit(graph, options);
    return { trained, graph, seconds: (performance.now() - started) / 1000 };
  } finally {
    progress.stop();
  }
}

export interface FitSummary {
  backend: BackendName;
  config: ModelConfig;
  entities: number;
  relations: number;
  epochs: number;
  seconds: number;
  bestValidMrr: number | null;
  bestEpoch: number | null;
}

export function fitSummary(model: TrainedModel, _graph: Graph, seconds: number): FitSummary {
  let best: { epoch: number; validMrr?: number } | undefined;
  for (const h of model.history) if (h.validMrr !== undefined && (best === undefined || h.validMrr > best.validMrr!)) best = h;
  return {
    backend: model.backend,
    config: model.config,
    entities: model.entities.count,
    relations: model.relations.count,
    epochs: model.history.length,
    seconds: Number(seconds.toFixed(1)),
    bestValidMrr: best?.validMrr === undefined ? null : Number(best.validMrr.toFixed(4)),
    bestEpoch: best?.epoch ?? null,
  };
}

function describe(config: ModelConfig): string {
  if (config.encoder === 'none') return `DistMult, dim ${config.dim}`;
  const decomposition = config.decomposition === 'basis' ? `basis B=${config.bases}` : config.decomposition === 'block' ? `block B=${config.blocks}` : 'full W_r';
  return `R-GCN (${config.layers} layer${config.layers === 1 ? '' : 's'}, ${decomposition}) + DistMult, dim ${config.dim}`;
}

export function fitText(s: FitSummary): string {
  const lines = [
    `fitted ${describe(s.config)} on ${s.entities.toLocaleString('en-US')} entities and ${s.relations.toLocaleString('en-US')} predicates`,
    `${s.epochs} epoch${s.epochs === 1 ? '' : 's'} in ${s.seconds} s on the ${s.backend} backend` +
      (s.bestValidMrr === null ? ' (no validation triples: no early stopping)' : `; best validation filtered MRR ${s.bestValidMrr.toFixed(3)} at epoch ${s.bestEpoch}`),
  ];
  return `${lines.join('\n')}\n`;
}


import { createWriteStream } from 'node:fs';
import { mkdir } from 'node:fs/promises';
import { dirname } from 'node:path';
import { finished } from 'node:stream/promises';
import type { Command } from 'commander';
import { PlumbError } from '../errors.js';
import { CORRUPTION_KINDS, corruptGraph, hasNamedGraphs, nQuadsLines, truthText, tsvLines, type CorruptionKind } from '../evaluation/corrupt.js';
import type { Graph } from '../graph/store.js';
import { DEFAULT_BASE_IRI, readGraph } from '../sources/index.js';
import type { RegisterCommand } from './commands.js';
import { addReadOptions, inputPaths, toReadOptions } from './read-options.js';
import { writeFileAtomic } from '../report/index.js';

/** `plumb corrupt`: a copy of the graph with injected errors, and the truth file listing them. */

export function parseKinds(value: string): CorruptionKind[] {
  const kinds = value.split(',').map((k) => k.trim()).filter(Boolean);
  for (const k of kinds) {
    if (!(CORRUPTION_KINDS as readonly string[]).includes(k)) {
      throw new PlumbError('E_USAGE', `unknown error kind "${k}"`, { hint: `use --kind ${CORRUPTION_KINDS.join('|')} (or several, comma-separated)` });
    }
  }
  if (kinds.length === 0) throw new PlumbError('E_USAGE', 'no error kind given', { hint: `use --kind ${CORRUPTION_KINDS.join('|')}` });
  return [...new Set(kinds)] as CorruptionKind[];
}

export function parseNumber(name: string, value: string, check: (x: number) => boolean, hint: string): number {
  const x = Number(value);
  if (value.trim() === '' || !Number.isFinite(x) || !check(x)) throw new PlumbError('E_USAGE', `${name} ${value} is out of range`, { hint });
  return x;
}

type OutputFormat = 'ntriples' | 'nquads' | 'tsv';

function outputFormat(path: string): OutputFormat {
  const lower = path.toLowerCase().replace(/\.gz$/, '');
  if (lower.endsWith('.nq')) return 'nquads';
  if (lower.endsWith('.tsv') || lower.endsWith('.txt') || lower.endsWith('.tab')) return 'tsv';
  if (lower.endsWith('.nt') || lower === '-') return 'ntriples';
  throw new PlumbError('E_USAGE', `cannot tell the output format of ${path}`, { hint: 'name the --out file .nt (N-Triples), .nq (N-Quads) or .tsv (tab-separated)' });
}

async function writeGraph(graph: Graph, path: string, format: OutputFormat, baseIri: string): Promise<void> {
  if (format === 'ntriples' && hasNamedGraphs(graph)) {
    throw new PlumbError('E_USAGE', `the input has named graphs, which N-Triples cannot hold (${path})`, { hint: 'name the --out file .nq to write N-Quads' });
  }
  await mkdir(dirname(path), { recursive: true });
  const out = createWriteStream(path, { encoding: 'utf8' });
  const lines = format === 'tsv' ? tsvLines(graph, baseIri) : nQuadsLines(graph);
  try {
    for (const line of lines) if (!out.write(line)) await new Promise<void>((r) => out.once('drain', () => r()));
    out.end();
    await finished(out);
  } catch (error) {
    out.destroy();
    throw new PlumbError('E_INPUT', `cannot write ${path}: ${(error as Error).message}`, { hint: 'check that the folder exists and is writable', cause: error });
  }
}

export const registerCorrupt: RegisterCommand = (program: Command, { io }) => {
  const command = program
    .command('corrupt')
    .description(
      'Write a copy of the graph with injected errors, and a truth file listing exactly those triples, to\n' +
        'measure the auditor: `plumb audit` the copy, then `plumb evaluate --truth … --report …`.\n' +
        'Errors are added (the original triples stay), half replacing the subject and half the object:\n' +
        '  random     the replacement is any entity of the graph, drawn uniformly\n' +
        '  range      it is an entity already seen in that position of that predicate (type-plausible)\n' +
        '  predicate  the predicate is replaced by another predicate of the graph\n' +
        'No injected triple repeats a triple of the graph.',
    )
    .argument('<files...>', 'graph files (N-Triples, N-Quads, Turtle, TriG, CSV, TSV; `-` for stdin)')
    .requiredOption('--rate <share>', 'errors to add, as a share of the triples (0.05 = 5%)')
    .option('--kind <kinds>', `error kinds, comma-separated, shared out evenly: ${CORRUPTION_KINDS.join(', ')}`, 'random')
    .requiredOption('--out <file>', 'the corrupted graph: .nt (N-Triples), .nq (N-Quads) or .tsv (tab-separated, as the open datasets)')
    .requiredOption('--truth <file>', 'the truth file: TSV with a header; subject, predicate, object (N-Triples terms), graph, kind, replaced, original')
    .option('--seed <n>', 'seed of the draws', '1');
  addReadOptions(command);
  command.action(async (files: string[], opts: Record<string, unknown>) => {
    const rate = parseNumber('--rate', String(opts.rate), (x) => x > 0 && x <= 1, 'give a share in (0, 1], e.g. --rate 0.05');
    const seed = parseNumber('--seed', String(opts.seed), (x) => Number.isInteger(x) && x >= 0, 'give a whole number, e.g. --seed 1');
    const kinds = parseKinds(String(opts.kind));
    const [outPath, truthPath] = inputPaths([String(opts.out), String(opts.truth)], io) as [string, string];
    const format = outputFormat(outPath);
    const read = toReadOptions(opts, io);
    const { graph } = await readGraph(inputPaths(files, io), read);
    const corruption = corruptGraph(graph, { rate, kinds, seed });
    await writeGraph(corruption.graph, outPath, format, read.baseIri ?? DEFAULT_BASE_IRI);
    await mkdir(dirname(truthPath), { recursive: true });
    await writeFileAtomic(truthPath, truthText(corruption.graph, corruption.injected));
    const counts = kinds.map((k) => `${corruption.injected.filter((e) => e.kind === k).length} ${k}`).join(', ');
    io.stderr.write(`plumb: added ${corruption.injected.length} errors (${counts}) to ${graph.size} triples; wrote ${String(opts.out)} and ${String(opts.truth)}\n`);
  });
};

import type { Command } from 'commander';
import { profile, type DegreeSummary, type GraphProfile } from '../graph/profile.js';
import { createProgressSink } from '../report/index.js';
import { readGraph, type ReadResult } from '../sources/index.js';
import type { RegisterCommand } from './commands.js';
import { addReadOptions, inputPaths, toReadOptions } from './read-options.js';

/** `plumb stats <files…>`: read the graph and print its profile and the accounting of what was read. */

const SHOWN_PREDICATES = 25;
const SHOWN_REJECTIONS = 10;

const HELP = `
Every statement read is counted once: kept, a duplicate of one already read, or rejected with its
file:line:column and the parser's reason (reading goes on after a rejection unless --strict).
Entities are the IRIs and blank nodes in subject or object position; literals are counted apart.

Examples:
  plumb stats graph.nt.gz
  plumb stats train.txt valid.txt test.txt --json
  cat dump.ttl | plumb stats - --format turtle`;

export const registerStats: RegisterCommand = (program: Command, { io, setExitCode }) => {
  const command = program
    .command('stats')
    .description(
      'profile a graph: counts, degrees, predicates, rdf:type coverage, and every rejected statement',
    )
    .argument(
      '<files...>',
      'graph files (N-Triples, N-Quads, Turtle, TriG, CSV, TSV; .gz too), or - for standard input',
    )
    .option('--json', 'print the profile as one JSON object on stdout');
  addReadOptions(command, { format: true });
  command.addHelpText('after', HELP);
  command.action(async (files: string[], flags: Record<string, unknown>) => {
    const progress = createProgressSink(io);
    let read: ReadResult;
    try {
      read = await readGraph(inputPaths(files, io), { ...toReadOptions(flags, io), progress: progress.sink });
    } finally {
      progress.stop();
    }
    const shape = profile(read.graph);
    if (flags.json === true) io.stdout.write(`${JSON.stringify(statsJson(read, shape), null, 2)}\n`);
    else io.stdout.write(statsText(read, shape));
    setExitCode(0);
  });
};

/** The object `plumb stats --json` prints. */
export function statsJson(read: ReadResult, shape: GraphProfile): Record<string, unknown> {
  return {
    read: read.accounting.read,
    triples: shape.triples,
    accepted: read.accounting.accepted,
    duplicates: read.accounting.duplicates,
    rejected: read.accounting.rejected,
    entities: shape.entities,
    predicates: shape.predicates,
    literals: shape.literals,
    blankNodes: shape.blankNodes,
    namedGraphs: shape.namedGraphs,
    terms: shape.terms,
    degree: shape.degree,
    outDegree: shape.outDegree,
    inDegree: shape.inDegree,
    types: shape.types,
    perPredicate: shape.perPredicate.map(({ predicate, triples, subjects, objects, literalObjects }) => ({
      predicate,
      triples,
      subjects,
      objects,
      literalObjects,
    })),
    inputs: read.inputs,
    rejections: read.rejections,
  };
}

const n = (x: number): string => x.toLocaleString('en-US');
const plural = (x: number, one: string, many = `${one}s`): string => `${n(x)} ${x === 1 ? one : many}`;

function degreeLine(d: DegreeSummary): string {
  return `min ${n(d.min)} · median ${n(d.median)} · mean ${d.mean.toFixed(1)} · p90 ${n(d.p90)} · p99 ${n(d.p99)} · max ${n(d.max)}`;
}

export function statsText(read: ReadResult, shape: GraphProfile): string {
  const { accounting, inputs, rejections } = read;
  const lines: string[] = [];
  lines.push(
    `Read ${plural(inputs.length, 'file')}: ${plural(accounting.read, 'statement')} = ${n(accounting.accepted)} kept + ` +
      `${n(accounting.duplicates)} duplicate${accounting.duplicates === 1 ? '' : 's'} + ${n(accounting.rejected)} rejected`,
  );
  const width = Math.max(...inputs.map((i) => i.path.length));
  for (const input of inputs) {
    lines.push(
      `  ${input.path.padEnd(width)}  ${input.format.padEnd(8)} ${plural(input.statements, 'statement').padStart(20)}  ${n(input.bytes)} bytes`,
    );
  }
  lines.push('');
  lines.push(
    `Graph: ${plural(shape.triples, 'triple')}, ${plural(shape.entities, 'entity', 'entities')} (${n(shape.blankNodes)} blank), ` +
      `${plural(shape.predicates, 'predicate')}, ${plural(shape.literals, 'literal')}` +
      (shape.namedGraphs > 0 ? `, ${plural(shape.namedGraphs, 'named graph')}` : ''),
  );
  lines.push(`Degree per entity: ${degreeLine(shape.degree)}`);
  lines.push(`  out (as subject): ${degreeLine(shape.outDegree)}`);
  lines.push(`  in (as object):   ${degreeLine(shape.inDegree)}`);
  const { types } = shape;
  lines.push(
    `rdf:type: ${n(types.typed)} of ${plural(types.of, 'entity', 'entities')} typed (${(100 * types.share).toFixed(1)} %)` +
      (types.classes > 0 ? `, ${plural(types.classes, 'class', 'classes')} used` : ''),
  );
  if (shape.perPredicate.length > 0) {
    lines.push('');
    lines.push('Predicates, most used first:  triples  subjects  objects  literal objects');
    const shown = shape.perPredicate.slice(0, SHOWN_PREDICATES);
    const nameWidth = Math.min(60, Math.max(...shown.map((p) => p.predicate.length)));
    for (const p of shown) {
      const name =
        p.predicate.length > nameWidth
          ? `…${p.predicate.slice(-(nameWidth - 1))}`
          : p.predicate.padEnd(nameWidth);
      lines.push(
        `  ${name}  ${n(p.triples).padStart(9)} ${n(p.subjects).padStart(9)} ${n(p.objects).padStart(8)} ${n(p.literalObjects).padStart(8)}`,
      );
    }
    const rest = shape.perPredicate.length - shown.length;
    if (rest > 0) lines.push(`  … and ${plural(rest, 'more predicate')} (--json lists all)`);
  }
  if (rejections.length > 0) {
    lines.push('');
    lines.push(`Rejected statements (${n(rejections.length)}):`);
    for (const r of rejections.slice(0, SHOWN_REJECTIONS))
      lines.push(`  ${r.file}:${r.line}:${r.column}: ${r.reason}`);
    if (rejections.length > SHOWN_REJECTIONS)
      lines.push(`  … and ${n(rejections.length - SHOWN_REJECTIONS)} more (--json lists all)`);
  }
  return `${lines.join('\n')}\n`;
}

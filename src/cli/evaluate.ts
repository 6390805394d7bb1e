import type { Command } from 'commander';
import { PlumbError, usageError } from '../errors.js';
import type { LinkPredictionMetrics } from '../evaluation/link-prediction.js';
import type { BackendName } from '../model/types.js';
import { createProgressSink } from '../report/index.js';
import { readGraph } from '../sources/index.js';
import type { RegisterCommand } from './commands.js';
import { addDetectionOptions, runDetectionEvaluation } from './evaluate-detection.js';
import type { CliIO } from './io.js';
import { addBackendOption } from './fit.js';
import { addReadOptions, inputPaths, toReadOptions } from './read-options.js';

/**
 * `plumb evaluate`: link-prediction metrics of a saved model on test triples (this file), or detection
 * metrics against a truth file (`evaluate-detection.ts`, tried first: it answers when its options are given).
 */

const HELP = `
Link prediction (--model, --test): each test triple (s, p, o) is two queries, (s, p, ?) and (?, p, o);
the true answer is ranked among all entities after removing every other known true triple (the
"filtered" protocol of Bordes et al. 2013), ties counting half. Known triples are those of --known
and the test file. The model passes messages over the --known triples (never over the test triples);
without --known it uses the entity embeddings saved with the model and filters only the test triples.
Test triples with an entity or predicate the model never saw are skipped and counted.

Detection (--truth with --report or --baselines): see the options marked "detection".

Examples:
  plumb evaluate --model models/umls --test test.txt --known train.txt valid.txt
  plumb evaluate --model models/umls --test test.txt --known train.txt valid.txt --json
  plumb evaluate --truth truth.tsv --report reports/report.json`;

export const registerEvaluate: RegisterCommand = (program: Command, { io, setExitCode }) => {
  const command = program
    .command('evaluate')
    .description('measure a model: filtered MRR and Hits@k on test triples, or detection metrics against a truth file')
    .option('--model <dir>', 'link prediction: a model saved by `plumb fit --save`')
    .option('--test <file>', 'link prediction: the test triples')
    .option('--known <files...>', 'link prediction: known true triples to filter out and to pass messages over (e.g. train and valid)')
    .option('--json', 'print the metrics as one JSON object on stdout')
    .option('--seed <n>', 'seed of any random draw', '1');
  addBackendOption(command);
  addDetectionOptions(command);
  addReadOptions(command);
  command.addHelpText('after', HELP);
  command.action(async (flags: Record<string, unknown>) => {
    if (await runDetectionEvaluation(flags, io)) {
      setExitCode(0);
      return;
    }
    if (flags.model === undefined || flags.test === undefined) {
      throw usageError('plumb evaluate needs --model <dir> and --test <file> (link prediction), or --truth with --report or --baselines (detection)', 'run `plumb evaluate --help` for examples');
    }
    const result = await evaluateFiles(String(flags.model), String(flags.test), (flags.known as string[] | undefined) ?? [], flags, io);
    if (flags.json === true) io.stdout.write(`${JSON.stringify(linkPredictionJson(result.metrics, result.backend), null, 2)}\n`);
    else io.stdout.write(linkPredictionText(result.metrics, result.filteredBy));
    setExitCode(0);
  });
};

export interface LinkPredictionRun {
  metrics: LinkPredictionMetrics;
  backend: BackendName;
  filteredBy: 'known' | 'test';
}

/** Reads the test file (first, so its triples win duplicates) and the known files into one graph and ranks the test triples. */
export async function evaluateFiles(modelDir: string, test: string, known: string[], flags: Record<string, unknown>, io: CliIO): Promise<LinkPredictionRun> {
  const { loadModel } = await import('../model/index.js');
  const { evaluateLinkPrediction } = await import('../evaluation/link-prediction.js');
  const { indexesOfKeys, knownFrom } = await import('../scoring/ranking.js');
  const backendFlag = (flags.backend as BackendName | 'auto' | undefined) ?? 'auto';
  const progress = createProgressSink(io);
  try {
    const read = await readGraph(inputPaths([test, ...known], io), { ...toReadOptions(flags, io), progress: progress.sink });
    const graph = read.graph;
    const isTest = new Uint8Array(graph.size);
    let tests = 0;
    for (let t = 0; t < graph.size; t++) if (graph.provenance.file[t] === 0) (isTest[t] = 1), tests++;
    if (tests === 0) throw new PlumbError('E_INPUT', `the test file ${test} holds no triple`, { hint: 'pass a file of test triples with --test' });
    const testTriples = Int32Array.from({ length: tests }, () => 0);
    for (let t = 0, k = 0; t < graph.size; t++) if (isTest[t]) testTriples[k++] = t;

    if (known.length === 0) {
      // No graph to pass messages over: score with the embeddings saved at fit time.
      const model = await loadModel(modelDir, undefined, { backend: backendFlag });
      io.stderr.write(`plumb: model backend ${model.backend}; no --known files, so ranks are filtered by the test triples only\n`);
      try {
        const keys = Array.from(testTriples, (t) => [graph.terms.key(graph.s[t]!), graph.terms.key(graph.p[t]!), graph.terms.key(graph.o[t]!)] as const);
        const dictionary = (model as { dictionary?: import('../graph/terms.js').TermDictionary }).dictionary!;
        const entityOf = (key: string): number => model.entities.ofTerm[dictionary.id(key)] ?? -1;
        const relationOf = (key: string): number => (dictionary.id(key) < 0 ? -1 : (model.relations.ofTerm[dictionary.id(key)] ?? -1));
        const index = {
          s: Int32Array.from(keys, (k) => entityOf(k[0])),
          r: Int32Array.from(keys, (k) => relationOf(k[1])),
          o: Int32Array.from(keys, (k) => entityOf(k[2])),
        };
        const metrics = await evaluateLinkPrediction(model, graph, index, knownFrom(model, index), progress.sink);
        return { metrics, backend: model.backend, filteredBy: 'test' };
      } finally {
        model.dispose();
      }
    }

    const model = await loadModel(modelDir, graph, { backend: backendFlag, exclude: isTest });
    io.stderr.write(`plumb: model backend ${model.backend}\n`);
    try {
      const all = Int32Array.from({ length: graph.size }, (_, t) => t);
      const { s, r, o } = indexesOfKeys(model, graph, Array.from(all, (t) => [graph.terms.key(graph.s[t]!), graph.terms.key(graph.p[t]!), graph.terms.key(graph.o[t]!)] as const));
      const filter = knownFrom(model, { s, r, o });
      // Rank only test triples whose entities the saved model knew: an entity first seen in the test has no evidence.
      const unseen = model.unseen;
      const pick = (column: Int32Array): Int32Array => Int32Array.from(testTriples, (t) => column[t]!);
      const ts = pick(s);
      const tr = pick(r);
      const to = pick(o);
      if (unseen) {
        for (let i = 0; i < ts.length; i++) {
          if ((ts[i]! >= 0 && unseen[ts[i]!]) || (to[i]! >= 0 && unseen[to[i]!])) ts[i] = -1;
        }
      }
      const metrics = await evaluateLinkPrediction(model, graph, { s: ts, r: tr, o: to }, filter, progress.sink);
      return { metrics, backend: model.backend, filteredBy: 'known' };
    } finally {
      model.dispose();
    }
  } finally {
    progress.stop();
  }
}

const round = (x: number): number => Number(x.toFixed(6));

export function linkPredictionJson(m: LinkPredictionMetrics, backend: BackendName): Record<string, unknown> {
  return { mrr: round(m.mrr), hits1: round(m.hits1), hits3: round(m.hits3), hits10: round(m.hits10), queries: m.queries, triples: m.triples, skipped: m.skipped, backend };
}

export function linkPredictionText(m: LinkPredictionMetrics, filteredBy: 'known' | 'test'): string {
  const lines = [
    `filtered MRR ${m.mrr.toFixed(4)}   Hits@1 ${m.hits1.toFixed(4)}   Hits@3 ${m.hits3.toFixed(4)}   Hits@10 ${m.hits10.toFixed(4)}`,
    `${m.queries.toLocaleString('en-US')} queries (both directions of ${m.triples.toLocaleString('en-US')} test triples)` +
      (m.skipped > 0 ? `; ${m.skipped.toLocaleString('en-US')} skipped (entity or predicate unknown to the model)` : '') +
      (filteredBy === 'test' ? '; filtered by the test triples only' : ''),
  ];
  return `${lines.join('\n')}\n`;
}

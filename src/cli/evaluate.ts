import type { Command } from 'commander';
import { usageError } from '../errors.js';
import type { LinkPredictionRun } from '../evaluate.js';
import type { LinkPredictionMetrics } from '../evaluation/link-prediction.js';
import type { BackendName } from '../model/types.js';
import { createProgressSink } from '../report/index.js';
import type { RegisterCommand } from './commands.js';
import { addDetectionOptions, runDetectionEvaluation } from './evaluate-detection.js';
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
    const progress = createProgressSink(io);
    let result: LinkPredictionRun;
    try {
      const known = inputPaths((flags.known as string[] | undefined) ?? [], io);
      // Loaded on use: the model modules bring TensorFlow.js, which other commands do not need.
      const { evaluateLinkPredictionFiles } = await import('../evaluate.js');
      result = await evaluateLinkPredictionFiles({
        model: inputPaths([String(flags.model)], io)[0]!,
        test: inputPaths([String(flags.test)], io)[0]!,
        known,
        read: toReadOptions(flags, io),
        backend: (flags.backend as BackendName | 'auto' | undefined) ?? 'auto',
        progress: progress.sink,
      });
    } finally {
      progress.stop();
    }
    io.stderr.write(`plumb: model backend ${result.backend}${result.filteredBy === 'test' ? '; no --known files, so ranks are filtered by the test triples only' : ''}\n`);
    if (flags.json === true) io.stdout.write(`${JSON.stringify(linkPredictionJson(result.metrics, result.backend), null, 2)}\n`);
    else io.stdout.write(linkPredictionText(result.metrics, result.filteredBy));
    setExitCode(0);
  });
};

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

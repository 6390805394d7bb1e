import { isAbsolute, relative } from 'node:path';
import type { Command } from 'commander';
import { DEFAULT_SEED } from '../../fixtures/demo/generate.js';
import { runDemo, type DemoResult } from '../demo.js';
import { usageError } from '../errors.js';
import { createProgressSink } from '../report/index.js';
import { formatCount, formatShare } from '../report/common.js';
import type { RegisterCommand } from './commands.js';
import type { CliIO } from './io.js';
import { outPath } from './audit.js';

interface DemoFlags {
  out: string;
  scale: string;
  seed: string;
  fast?: boolean;
}

const HELP = `
The demo builds the ferry network of an invented archipelago (islands, ports, routes, vessels,
operators, crews) with an ontology and SHACL shapes, a base graph that is correct by construction and
an incoming file of new facts with planted errors of every kind, listed in truth.json. Then it
  1. audits the base graph (checks, and every triple scored out-of-fold by an R-GCN model),
  2. fits a model on the whole base graph and saves it,
  3. gates the incoming file against the base with the saved model,
and writes every report format: <out>/audit/ and <out>/gate/ (report.html, report.json,
report.sarif, junit.xml, summary.md). It prints how many planted errors the gate found.

The gate is expected to fail (the incoming file holds planted errors); the demo still exits 0 when it
ran. At scale 1 it takes about two to three minutes on two cores; --fast trades ranking quality for
time.

Examples:
  plumb demo
  plumb demo --out /tmp/demo --scale 0.3 --fast`;

function whole(name: string, value: string): number {
  const n = Number(value);
  if (!Number.isInteger(n) || n < 0 || n > 2 ** 31 - 1) throw usageError(`${name} must be a whole number of 0 or more, not "${value}"`);
  return n;
}

function scaleOf(value: string): number {
  const n = Number(value);
  if (value.trim() === '' || !Number.isFinite(n) || n <= 0 || n > 10) throw usageError(`--scale must be above 0 and at most 10, not "${value}"`, 'use --scale 1 for the full demo, 0.3 for a quick one');
  return n;
}

/** A path as the user would type it from the working folder. */
function shown(path: string, io: CliIO): string {
  const rel = relative(io.cwd, path);
  return rel !== '' && !rel.startsWith('..') && !isAbsolute(rel) ? rel : path;
}

const count = (n: number, word: string): string => `${formatCount(n)} ${word}${n === 1 ? '' : 's'}`;

const seconds = (s: number | undefined): string => (s === undefined ? '–' : s < 10 ? `${s.toFixed(1)} s` : `${Math.round(s)} s`);

/** What `plumb demo` prints on stdout once the run is done. */
export function demoSummary(r: DemoResult, io: CliIO): string {
  const lines: string[] = [];
  const p = (path: string): string => shown(path, io);
  const planted = r.truth.length;
  lines.push(`plumb demo: the ferry network of an invented archipelago (seed ${r.settings.seed}, scale ${r.settings.scale}${r.settings.fast ? ', fast' : ''})`);
  lines.push('');
  const base = r.audit.report.accounting;
  const inc = r.gate.report.accounting;
  lines.push(`data   ${p(r.dataDir)}/`);
  lines.push(`       base.nt ${formatCount(base.accepted)} triples, incoming.nt ${formatCount(inc.accepted)} triples with ${planted} planted errors (truth.json), ontology.ttl, shapes.ttl`);

  const a = r.audit.report.summary;
  lines.push(`audit  the base graph: ${count(a.findings, 'finding')} (${count(a.byKind.violation, 'violation')}, ${count(a.byKind.suspect, 'suspect')}), ${formatCount(a.scored)} triples scored out-of-fold`);
  if (a.trust) {
    lines.push(`       trust figure: of ${formatCount(a.trust.injected)} errors planted in a copy, ${formatShare(a.trust.precisionAtK)} came first (average precision ${formatShare(a.trust.averagePrecision)}, random order ${formatShare(a.trust.baseline)})`);
  }
  lines.push(`       ${p(r.audit.dir)}/report.html  (and report.json, report.sarif, junit.xml, summary.md, scores.tsv)`);

  lines.push(`model  ${p(r.modelDir)}/  fitted on the whole base graph`);

  const g = r.gate.report.summary;
  const outcome = r.gate.report.gate;
  lines.push(
    `gate   incoming.nt against the base, with the saved model: ${count(g.findings, 'finding')} ` +
      `(${count(g.bySeverity.error, 'error')}, ${count(g.bySeverity.warning, 'warning')}, ${count(g.bySeverity.note, 'note')}; ${count(g.byKind.suspect, 'suspect')})`,
  );
  if (outcome) {
    lines.push(`       ${outcome.passed ? 'passed' : 'FAILED, as expected: the incoming file holds planted errors'}${outcome.crossed.length > 0 ? ` (${outcome.crossed.join('; ')})` : ''}`);
  }
  lines.push(`       ${p(r.gate.dir)}/report.html  (and report.json, report.sarif, junit.xml, summary.md)`);

  const e = r.evaluation;
  const byKind = Object.entries(e.schema.byKind)
    .map(([kind, v]) => `${kind} ${v.found}/${v.planted}`)
    .join(', ');
  lines.push('');
  lines.push(`truth  planted schema errors found by the expected check: ${e.schema.found} of ${e.schema.planted} (${byKind})`);
  const pl = e.plausible;
  lines.push(
    `       type-correct errors (only the model can see them), ranked among the correct incoming triples: ` +
      `precision@${pl.scored} ${formatShare(pl.precisionAtK)} (a random order: ${formatShare(pl.baseline)}), ` +
      `${formatShare(pl.recallTop5pct)} of the ${pl.planted} in the least plausible 5%, ${pl.listed} listed as suspects`,
  );
  const s = r.seconds;
  lines.push('');
  lines.push(`time   ${seconds(s.total)}: data ${seconds(s.data)}, audit ${seconds(s.audit)}, fit ${seconds(s.fit)}, gate ${seconds(s.gate)}, reports ${seconds(s.reports)}`);
  lines.push('');
  lines.push(`Open ${p(r.audit.dir)}/report.html in a browser. Findings are candidates for a reviewer, not verdicts.`);
  return `${lines.join('\n')}\n`;
}

export const registerDemo: RegisterCommand = (program, { io, setExitCode }) => {
  const command: Command = program
    .command('demo')
    .summary('build the invented demo scenario, audit it, gate its incoming file, and write every report')
    .description('Build the demo scenario (an invented archipelago\'s ferry network with planted errors), audit and gate it, and write the reports.')
    .option('--out <dir>', 'folder for the data, the model and the reports', 'reports/demo')
    .option('--scale <s>', 'size of the scenario: 1 is about 30,000 base triples', '1')
    .option('--seed <n>', 'seed of the scenario and the model', String(DEFAULT_SEED))
    .option('--fast', 'fewer epochs and no trust figure: about half the time, a rougher ranking');
  command.addHelpText('after', HELP);
  command.action(async (flags: DemoFlags) => {
    const scale = scaleOf(flags.scale);
    const seed = whole('--seed', flags.seed);
    const progress = createProgressSink(io);
    let result: DemoResult;
    try {
      result = await runDemo({ out: outPath(flags.out, io), scale, seed, fast: flags.fast === true, progress: progress.sink });
    } finally {
      progress.stop();
    }
    io.stdout.write(demoSummary(result, io));
    setExitCode(0);
  });
};

import { Option, type Command } from 'commander';
import { check } from '../checks/run.js';
import { CHECK_IDS } from '../checks/index.js';
import { usageError } from '../errors.js';
import { atLeast, SEVERITIES, type Severity } from '../findings.js';
import { DEFAULT_MINED_OPTIONS } from '../schema/mined.js';
import { Chalk } from 'chalk';
import { createProgressSink } from '../report/index.js';
import { NOT_VERDICTS_HEAD, countOf, formatCount, sourceLabel, truncate } from '../report/common.js';
import type { AuditReport } from '../result.js';
import { writeJson } from '../report/json.js';
import type { RegisterCommand } from './commands.js';
import { isInteractive } from './io.js';
import { addReadOptions, inputPaths, toReadOptions } from './read-options.js';

interface CheckFlags {
  schema?: string[];
  shapes?: string[];
  closedWorld?: boolean;
  minSupport?: number;
  minConfidence?: number;
  only?: string[];
  skip?: string[];
  json?: boolean;
  failOn: Severity;
  top?: number;
}

const HELP = `
How RDFS is read: RDFS is open-world. A subject that lacks the class its predicate's rdfs:domain
names (or an object that lacks the rdfs:range class) is not a contradiction: RDFS would simply infer
the type. plumb reports it as a warning ("missing type"), because it is usually an omission or a
wrong link. A subject whose stated types are declared disjoint with the required class
(owl:disjointWith, owl:AllDisjointClasses) is a contradiction and an error. --closed-world reads a
missing type as an error too, and two different resources as values of an owl:FunctionalProperty
as an error (open world: OWL would infer they are the same individual, a warning).

Checks: ${CHECK_IDS.join(', ')}.
Mined checks learn rules from the data itself (after Paulheim & Bizer 2014): a rule needs
--min-support cases and holds on at least --min-confidence of them; findings that break one are
notes, or warnings when the rule holds on 99% of 100 or more.
SHACL: the Core subset of targets, predicate and inverse paths, sh:class, datatype, nodeKind,
minCount, maxCount, in, hasValue, pattern (+flags), min/maxInclusive, min/maxExclusive,
min/maxLength, severity, message, deactivated. Anything else in a shapes file is reported by name.

Exit codes: 0 no finding at or above --fail-on, 1 there is one, 2 bad usage or unreadable input.

Examples:
  plumb check graph.ttl --schema ontology.ttl --shapes shapes.ttl
  plumb check data.nt --json --fail-on warning > findings.json`;

function positiveInteger(value: string): number {
  const n = Number(value);
  if (!Number.isInteger(n) || n < 1) throw usageError(`--min-support must be a whole number of 1 or more, not "${value}"`);
  return n;
}

function share(value: string): number {
  const n = Number(value);
  if (!(n > 0 && n <= 1)) throw usageError(`--min-confidence must be a number in (0, 1], not "${value}"`, 'for example --min-confidence 0.95');
  return n;
}

function checkList(value: string, previous: string[] | undefined): string[] {
  return [...(previous ?? []), ...value.split(',').map((s) => s.trim()).filter(Boolean)];
}

export const registerCheck: RegisterCommand = (program, { io, setExitCode }) => {
  const command: Command = program
    .command('check')
    .summary('run the schema, SHACL and mined checks only (no model): fast')
    .description(
      'Check a graph against what it declares (RDFS/OWL axioms in the graph and in --schema files, SHACL shapes ' +
        'in --shapes files) and against rules mined from its own data. No model is trained.',
    )
    .argument('<files...>', 'graph files (N-Triples, N-Quads, Turtle, TriG, CSV/TSV, optionally .gz; - for stdin)')
    .option('--schema <files...>', 'ontology files whose RDFS/OWL axioms apply besides those in the graph')
    .option('--shapes <files...>', 'SHACL shapes files')
    .option('--closed-world', 'read a missing type as an error (see below)')
    .option('--min-support <n>', `cases a mined rule needs (default ${DEFAULT_MINED_OPTIONS.minSupport})`, positiveInteger)
    .option('--min-confidence <c>', `share of cases a mined rule must hold on, in (0, 1] (default ${DEFAULT_MINED_OPTIONS.minConfidence})`, share)
    .option('--only <checks>', 'run only these checks (comma-separated ids)', checkList)
    .option('--skip <checks>', 'skip these checks (comma-separated ids)', checkList)
    .option('--json', 'print the report as JSON to stdout (an object with a findings array)')
    .addOption(new Option('--fail-on <severity>', 'exit 1 when a finding at or above this severity exists').choices(SEVERITIES).default('error'))
    .option('--top <n>', 'findings listed in the terminal summary (default 10)', positiveInteger);
  addReadOptions(command);
  command.addHelpText('after', HELP);
  command.action(async (files: string[], flags: CheckFlags & Record<string, unknown>) => {
    const progress = createProgressSink(io);
    let report;
    try {
      report = await check(inputPaths(files, io), {
        ...(flags.schema ? { schema: inputPaths(flags.schema, io) } : {}),
        ...(flags.shapes ? { shapes: inputPaths(flags.shapes, io) } : {}),
        ...(flags.closedWorld ? { closedWorld: true } : {}),
        ...(flags.minSupport !== undefined ? { minSupport: flags.minSupport } : {}),
        ...(flags.minConfidence !== undefined ? { minConfidence: flags.minConfidence } : {}),
        ...(flags.only ? { only: flags.only } : {}),
        ...(flags.skip ? { skip: flags.skip } : {}),
        read: toReadOptions(flags, io),
        progress: progress.sink,
      });
    } finally {
      progress.stop();
    }
    if (flags.json) io.stdout.write(writeJson(report));
    else io.stdout.write(formatCheckSummary(report, isInteractive(io), flags.top ?? 10));
    setExitCode(report.findings.some((f) => atLeast(f.severity, flags.failOn)) ? 1 : 0);
  });
};

/**
 * The terminal summary of a check run: counts per check and severity, then the first findings with
 * their messages (for a violation the message says what is wrong, the triple alone does not).
 */
function formatCheckSummary(report: AuditReport, color: boolean, top: number): string {
  const c = new Chalk({ level: color ? 1 : 0 });
  const paint = (severity: Severity, text: string): string => (severity === 'error' ? c.red.bold(text) : severity === 'warning' ? c.yellow(text) : c.cyan(text));
  const plain = (text: string): string => text.replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029]/g, ' ');
  const a = report.accounting;
  const sev = report.summary.bySeverity;
  const out = [
    `${c.bold('plumb check')}  ${countOf(report.inputs.length, 'input')}, ${countOf(a.read, 'statement')} read (${formatCount(a.accepted)} accepted, ${countOf(a.duplicates, 'duplicate')}, ${formatCount(a.rejected)} rejected)`,
    `${c.bold(countOf(report.summary.findings, 'finding'))}: ${paint('error', countOf(sev.error, 'error'))}, ${paint('warning', countOf(sev.warning, 'warning'))}, ${paint('note', countOf(sev.note, 'note'))}`,
  ];
  const byCheck = new Map<string, Record<Severity, number>>();
  for (const f of report.findings) {
    let row = byCheck.get(f.check);
    if (!row) byCheck.set(f.check, (row = { error: 0, warning: 0, note: 0 }));
    row[f.severity]++;
  }
  const width = Math.max(0, ...[...byCheck.keys()].map((k) => k.length));
  for (const [check, counts] of [...byCheck].sort(([x], [y]) => (x < y ? -1 : 1))) {
    const parts = SEVERITIES.filter((s) => counts[s] > 0).map((s) => paint(s, countOf(counts[s], s)));
    out.push(`  ${check.padEnd(width)}  ${parts.join(', ')}`);
  }
  const shown = report.findings.slice(0, top);
  if (shown.length > 0) out.push(c.bold(`first ${shown.length}:`));
  for (const f of shown) {
    const where = sourceLabel(f);
    out.push(`  ${paint(f.severity, f.severity.padEnd(7))} ${f.check}${where ? `  ${plain(truncate(where, 120))}` : ''}`);
    out.push(`          ${plain(truncate(f.message, 300))}`);
  }
  if (report.findings.length > shown.length) out.push(c.dim(`  … ${formatCount(report.findings.length - shown.length)} more: use --json, or --top`));
  out.push(c.dim(NOT_VERDICTS_HEAD));
  return `${out.join('\n')}\n`;
}

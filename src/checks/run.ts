import { PlumbError } from '../errors.js';
import type { Finding, Severity } from '../findings.js';
import type { Graph } from '../graph/store.js';
import type { ProgressSink } from '../progress.js';
import type { Accounting, AuditReport, CheckInfo, InputInfo, PredicateRow } from '../result.js';
import { loadSchema, type Schema } from '../schema/index.js';
import { readGraph, type ReadOptions, type ReadResult, type Rejection } from '../sources/index.js';
import { VERSION } from '../version.js';
import { checkInfo, resolveCheckOptions, runChecks, selectedChecks, sortFindings, type RunChecksOptions } from './index.js';

/** What `plumb check` and {@link check} take beyond the graph files. */
export interface CheckRunOptions extends RunChecksOptions {
  /** Ontology files whose RDFS/OWL axioms apply besides those in the graph itself (`--schema`). */
  schema?: readonly string[];
  /** SHACL shapes files (`--shapes`). */
  shapes?: readonly string[];
  /** How to read the graph files; schema and shapes files take their format from their names. */
  read?: ReadOptions;
  progress?: ProgressSink;
}

/** The outcome of the checks on a graph already in memory. */
export interface GraphCheckResult {
  findings: Finding[];
  checks: CheckInfo[];
  schema: Schema;
}

/**
 * Runs the schema and mined checks on a graph in memory. The argument order matches the audit's
 * `checks` step, so `checkGraph` can be passed to it as is.
 */
export async function checkGraph(
  graph: Graph,
  schemaGraphs: readonly Graph[] = [],
  shapesGraphs: readonly Graph[] = [],
  progress?: ProgressSink,
  options: RunChecksOptions = {},
): Promise<GraphCheckResult> {
  const schema = loadSchema(graph, schemaGraphs, shapesGraphs);
  const findings = runChecks(graph, schema, options, progress);
  return { findings, checks: selectedChecks(options).map(checkInfo), schema };
}

const SYNTAX_CHECK: CheckInfo = { id: 'syntax', title: 'Statement that could not be read', severity: 'error' };

/** A rejected statement as a `syntax` finding, so the report and the gate see it too. */
export function rejectionFinding(rejection: Rejection): Finding {
  return {
    kind: 'syntax',
    check: 'syntax',
    severity: 'error',
    subject: '',
    predicate: '',
    object: '',
    message: rejection.reason,
    source: { file: rejection.file, line: rejection.line, column: rejection.column },
    evidence: { text: rejection.text },
  };
}

export interface InputsRead {
  data: ReadResult;
  schemaRead: ReadResult | undefined;
  shapesRead: ReadResult | undefined;
  /** Every statement rejected in the graph, schema and shapes files, in that order. */
  rejections: Rejection[];
  readSeconds: number;
}

/**
 * Reads the graph files, then the `--schema` and `--shapes` files with the same base IRI and
 * strictness (never from standard input: that stream is the graph's). Shared by `check` and `audit`.
 */
export async function readInputs(
  paths: readonly string[],
  options: { schema?: readonly string[] | undefined; shapes?: readonly string[] | undefined; read?: ReadOptions | undefined; progress?: ProgressSink | undefined },
): Promise<InputsRead> {
  const started = performance.now();
  const read = options.read ?? {};
  const progress = options.progress;
  const data = await readGraph(paths, { ...read, ...(progress ? { progress } : {}) });
  const side = async (files: readonly string[] | undefined, what: string): Promise<ReadResult | undefined> => {
    if (!files || files.length === 0) return undefined;
    if (files.includes('-')) throw new PlumbError('E_USAGE', `${what} files cannot be read from standard input`, { hint: `give the ${what} file by name` });
    return readGraph(files, { ...(read.baseIri !== undefined ? { baseIri: read.baseIri } : {}), ...(read.strict !== undefined ? { strict: read.strict } : {}) });
  };
  const schemaRead = await side(options.schema, '--schema');
  const shapesRead = await side(options.shapes, '--shapes');
  const rejections = [...data.rejections, ...(schemaRead?.rejections ?? []), ...(shapesRead?.rejections ?? [])];
  return { data, schemaRead, shapesRead, rejections, readSeconds: (performance.now() - started) / 1000 };
}

/**
 * `plumb check` as a function: reads the graph, the `--schema` and `--shapes` files, runs the checks
 * and returns the report (command `check`, no model). Problems in the input files are thrown as
 * PlumbError (exit 2); problems in the schema or shapes become findings of the `schema` check.
 */
export async function check(paths: readonly string[], options: CheckRunOptions = {}): Promise<AuditReport> {
  // Validate the check selection before reading anything large.
  const checks = selectedChecks(options);
  const progress = options.progress;
  const { data, schemaRead, shapesRead, rejections, readSeconds } = await readInputs(paths, options);

  const checkStarted = performance.now();
  const result = await checkGraph(data.graph, schemaRead ? [schemaRead.graph] : [], shapesRead ? [shapesRead.graph] : [], progress, options);
  const checkSeconds = (performance.now() - checkStarted) / 1000;

  const findings = sortFindings([...rejections.map(rejectionFinding), ...result.findings]);
  const resolved = resolveCheckOptions(options);
  return checkReport(data.graph, findings, {
    inputs: data.inputs,
    accounting: data.accounting,
    checks: [...(rejections.length > 0 ? [SYNTAX_CHECK] : []), ...checks.map(checkInfo)],
    durations: { read: round(readSeconds), checks: round(checkSeconds) },
    options: {
      closedWorld: resolved.closedWorld,
      minSupport: resolved.mined.minSupport,
      minConfidence: resolved.mined.minConfidence,
      checks: checks.map((c) => c.meta.id),
      schema: schemaRead?.inputs ?? [],
      shapes: shapesRead?.inputs ?? [],
    },
  });
}

const round = (x: number): number => Math.round(x * 1000) / 1000;

/** Lays findings out as a report of command `check`. */
export function checkReport(
  graph: Graph,
  findings: Finding[],
  parts: { inputs: InputInfo[]; accounting: Accounting; checks: CheckInfo[]; durations: Record<string, number>; options: Record<string, unknown> },
): AuditReport {
  const byKind = { syntax: 0, violation: 0, suspect: 0 };
  const bySeverity: Record<Severity, number> = { error: 0, warning: 0, note: 0 };
  for (const f of findings) {
    byKind[f.kind]++;
    bySeverity[f.severity]++;
  }
  const rows = new Map<number, PredicateRow>();
  const offsets = graph.byPredicate.offsets;
  for (let p = 0; p + 1 < offsets.length; p++) {
    const n = offsets[p + 1]! - offsets[p]!;
    if (n > 0) rows.set(p, { predicate: graph.terms.key(p), triples: n, violations: 0, suspects: 0 });
  }
  for (const f of findings) {
    if (f.triple === undefined || f.kind !== 'violation') continue;
    const r = rows.get(graph.p[f.triple]!);
    if (r) r.violations++;
  }
  const predicates = [...rows.values()].sort((a, b) => b.triples - a.triples || (a.predicate < b.predicate ? -1 : 1));
  return {
    format: 'plumb-report',
    formatVersion: 1,
    tool: { name: 'plumb', version: VERSION },
    command: 'check',
    createdAt: new Date().toISOString(),
    inputs: parts.inputs,
    accounting: parts.accounting,
    options: parts.options,
    durations: parts.durations,
    summary: { findings: findings.length, byKind, bySeverity, scored: 0 },
    predicates,
    findings,
    checks: parts.checks,
  };
}

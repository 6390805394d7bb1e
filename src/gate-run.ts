import { readGraph, readInto, type ReadOptions, type ReadResult } from './sources/index.js';
import { GraphBuilder } from './graph/store.js';
import { PlumbError } from './errors.js';
import { rejectionFinding } from './checks/run.js';
import { auditGraphDetailed, defaultSteps, type AuditOptions, type TripleScores } from './audit.js';
import type { Graph } from './graph/store.js';
import { loadModel } from './model/index.js';
import { decideGate, loadSuppressions, type GateThresholds, type Suppression } from './gate.js';
import type { AuditReport } from './result.js';

/** What `plumb gate` takes beyond the incoming files. */
export interface GateRunOptions extends AuditOptions {
  /** The graph the incoming triples are merged into (`--base`). */
  base: readonly string[];
  schema?: readonly string[];
  shapes?: readonly string[];
  read?: ReadOptions;
  /** A model saved by `plumb fit --save` on the base graph: scores the incoming triples without a refit. */
  modelDir?: string;
  suppressions?: string | readonly Suppression[];
  thresholds?: GateThresholds;
  /** The day expiry dates are compared with (default: now). */
  today?: Date;
}

export interface GateRun {
  report: AuditReport;
  /** 0 when no threshold was crossed, 1 otherwise. */
  exitCode: 0 | 1;
}

/** The gate's run with the model's scores of the incoming triples and the merged graph they index. */
export interface GateRunDetailed extends GateRun {
  scores: TripleScores | undefined;
  graph: Graph;
}

/**
 * The merge gate: audits only the incoming triples, in the context of base + incoming. Incoming
 * triples already in the base are duplicates and not audited. The incoming triples are split into
 * folds; each fold is scored with its own triples hidden. With a saved model nothing is refit: the
 * model is loaded once per fold with that fold's triples left out of message passing. Without one,
 * fold models are fitted on the base and the other incoming triples, as in an audit. Suppressions are applied, then the thresholds decide.
 */
export async function gate(incoming: readonly string[], options: GateRunOptions): Promise<GateRun> {
  const { report, exitCode } = await gateDetailed(incoming, options);
  return { report, exitCode };
}

/** {@link gate}, with the scores of every incoming triple the model scored (what `plumb demo` measures). */
export async function gateDetailed(incoming: readonly string[], options: GateRunOptions): Promise<GateRunDetailed> {
  if (options.base.length === 0) throw new PlumbError('E_USAGE', 'the gate needs the base graph', { hint: 'name it with --base <files...>' });
  const started = performance.now();
  const read = options.read ?? {};
  const progress = options.progress;
  const readOptions: ReadOptions = { ...read, ...(progress ? { progress } : {}) };
  const builder = new GraphBuilder();
  const baseRead = await readInto(builder, options.base, readOptions);
  const firstIncomingFile = options.base.length;
  const incomingRead = await readInto(builder, incoming, readOptions);
  const graph = builder.build();
  const only = new Uint8Array(graph.size);
  for (let t = 0; t < graph.size; t++) if (graph.provenance.file[t]! >= firstIncomingFile) only[t] = 1;

  const side = async (files: readonly string[] | undefined): Promise<ReadResult | undefined> =>
    files && files.length > 0 ? readGraph(files, { ...(read.baseIri !== undefined ? { baseIri: read.baseIri } : {}) }) : undefined;
  const schemaRead = await side(options.schema);
  const shapesRead = await side(options.shapes);
  const suppressions =
    options.suppressions === undefined ? [] : typeof options.suppressions === 'string' ? await loadSuppressions(options.suppressions) : options.suppressions;
  const readSeconds = (performance.now() - started) / 1000;

  // With a saved model, a fold's "fit" loads it with the fold's incoming triples hidden from message
  // passing: no refit, and no incoming triple is evidence for itself through its own edge, while the
  // other incoming triples (a new entity's other facts) stay as context.
  const steps = defaultSteps(options.checkOptions);
  const modelDir = options.modelDir !== undefined && !options.noModel ? options.modelDir : undefined;
  if (modelDir !== undefined) {
    const backend = options.backend;
    steps.fit = (g, fitOptions = {}) =>
      loadModel(modelDir, g, { ...(backend ? { backend } : {}), ...(fitOptions.exclude ? { exclude: fitOptions.exclude } : {}) });
    // Fold workers would fit with plumb's own fit; loading is quick, so the folds stay in this thread.
    steps.workers = false;
  }
  const rejections = [...incomingRead.rejections, ...(schemaRead?.rejections ?? []), ...(shapesRead?.rejections ?? [])];
  const run = await auditGraphDetailed(graph, {
    ...options,
    command: 'gate',
    only,
    // The trust figure measures a whole-graph ranking; the gate reports on a handful of triples.
    calibrate: options.calibrate ?? false,
    folds: options.folds ?? 2,
    inputs: [...baseRead.inputs, ...incomingRead.inputs],
    accounting: incomingRead.accounting,
    readFindings: rejections.map(rejectionFinding),
    readSeconds,
    schemaGraphs: schemaRead ? [schemaRead.graph] : [],
    shapesGraphs: shapesRead ? [shapesRead.graph] : [],
  }, steps);
  const report = run.report;
  const decision = decideGate(report.findings, suppressions, options.thresholds ?? {}, options.today ?? new Date());
  report.findings = decision.active;
  report.suppressed = decision.suppressed;
  report.gate = decision.outcome;
  report.options.base = baseRead.inputs.map((i) => i.path);
  report.options.baseAccounting = baseRead.accounting;
  if (modelDir !== undefined) {
    report.options.modelDir = modelDir;
    report.options.model = 'given, each fold of incoming triples hidden from message passing';
  }
  recount(report);
  return { report, exitCode: decision.exitCode, scores: run.scores, graph };
}

/** Summary counts after suppressions removed findings from the list. */
function recount(report: AuditReport): void {
  const byKind = { syntax: 0, violation: 0, suspect: 0 };
  const bySeverity = { error: 0, warning: 0, note: 0 };
  for (const f of report.findings) {
    byKind[f.kind]++;
    bySeverity[f.severity]++;
  }
  report.summary.findings = report.findings.length;
  report.summary.byKind = byKind;
  report.summary.bySeverity = bySeverity;
}

import { readGraph, readInto, type ReadOptions, type ReadResult } from './sources/index.js';
import { GraphBuilder } from './graph/store.js';
import { PlumbError } from './errors.js';
import { rejectionFinding } from './checks/run.js';
import { auditGraph, type AuditOptions } from './audit.js';
import { loadModel, type TrainedModel } from './model/index.js';
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

/**
 * The merge gate: audits only the incoming triples, in the context of base + incoming. Incoming
 * triples already in the base are duplicates and not audited. With a saved model nothing is refit;
 * without one, fold models are fitted on the base and the other incoming triples with the fold's
 * triples hidden, as in an audit. Suppressions are applied, then the thresholds decide.
 */
export async function gate(incoming: readonly string[], options: GateRunOptions): Promise<GateRun> {
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

  let model: TrainedModel | undefined;
  if (options.modelDir !== undefined && !options.noModel) {
    model = await loadModel(options.modelDir, graph, options.backend ? { backend: options.backend } : {});
  }
  const rejections = [...incomingRead.rejections, ...(schemaRead?.rejections ?? []), ...(shapesRead?.rejections ?? [])];
  try {
    const report = await auditGraph(graph, {
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
      ...(model ? { trainedModel: model } : {}),
    });
    const decision = decideGate(report.findings, suppressions, options.thresholds ?? {}, options.today ?? new Date());
    report.findings = decision.active;
    report.suppressed = decision.suppressed;
    report.gate = decision.outcome;
    report.options.base = baseRead.inputs.map((i) => i.path);
    report.options.baseAccounting = baseRead.accounting;
    if (options.modelDir !== undefined) report.options.modelDir = options.modelDir;
    recount(report);
    return { report, exitCode: decision.exitCode };
  } finally {
    model?.dispose();
  }
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

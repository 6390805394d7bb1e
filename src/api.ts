/**
 * plumb's programmatic API: everything the CLI can do, as functions. The CLI is a thin shell over
 * this module; nothing here depends on the CLI.
 *
 * ```ts
 * import { audit, writeReports } from 'plumb';
 * const report = await audit(['graph.ttl'], { schema: ['ontology.ttl'], seed: 1 });
 * await writeReports(report, 'reports', ['json', 'html']);
 * ```
 */
export { PlumbError, formatPosition, type ErrorCode, type SourcePosition } from './errors.js';
export { atLeast, severityRank, SEVERITIES, type Finding, type FindingKind, type Severity, type SourceLocation } from './findings.js';
export type { ProgressEvent, ProgressSink } from './progress.js';
export type { Accounting, AuditReport, CheckInfo, GateOutcome, InputInfo, PredicateRow, SuppressedFinding, TrustFigure } from './result.js';
export { VERSION } from './version.js';

// Reading and the graph store
export { readGraph, readInto, INPUT_FORMATS, DEFAULT_BASE_IRI, type InputFormat, type ReadOptions, type ReadResult, type Rejection } from './sources/index.js';
export { TermDictionary, TermKind, literalKey, literalParts, toNTriples } from './graph/terms.js';
export { GraphBuilder, graphFromKeys, row, type Graph, type Csr } from './graph/store.js';
export { profile, entityIds, type GraphProfile } from './graph/profile.js';

// Schema and checks (`plumb check`)
export { check, checkGraph, rejectionFinding, type CheckRunOptions, type GraphCheckResult } from './checks/run.js';
export { runChecks, ALL_CHECKS, CHECK_IDS, type RunChecksOptions, type Check, type CheckMeta, type CheckContext } from './checks/index.js';
export { loadSchema, Schema, type SchemaIssue, type Shape } from './schema/index.js';
export { DEFAULT_MINED_OPTIONS, type MinedOptions } from './schema/mined.js';

// The model (`plumb fit`, `plumb evaluate`)
export { initBackend, fit, loadModel, DEFAULT_MODEL_CONFIG, type BackendName, type FitOptions, type ModelConfig, type TrainedModel } from './model/index.js';
export { filteredRanks, rankTriples, type Ranks } from './scoring/ranking.js';
export { evaluateLinkPrediction, linkPredictionMetrics, type LinkPredictionMetrics } from './evaluation/link-prediction.js';

// The audit (`plumb audit`), error injection and detection metrics (`plumb corrupt`, `plumb evaluate`)
export { audit, auditDetailed, auditGraph, AUDIT_DEFAULTS, type AuditOptions, type AuditGraphOptions, type AuditRunOptions, type AuditRun } from './audit.js';
export { crossFit, type CrossFitOptions, type CrossFitResult } from './scoring/crossfit.js';
export { plausibility, PLAUSIBILITY_BASES, type PlausibilityBasis } from './scoring/plausibility.js';
export { explainTriples, type Explanation } from './scoring/explain.js';
export { evaluateLinkPredictionFiles, evaluateAuditRanking, compareBaselines, readTruth, kindsOf, typeDistributionSuspicion, type LinkPredictionFilesOptions, type LinkPredictionRun, type BaselineComparisonOptions } from './evaluate.js';
export { corruptGraph, CORRUPTION_KINDS, parseTruth, type CorruptOptions, type Corruption, type CorruptionKind, type TruthEntry } from './evaluation/corrupt.js';
export { averagePrecision, rocAuc, precisionAt, recallAtShare, detectionMetrics, detectionTable, type DetectionMetrics } from './evaluation/detection.js';
export { compareMethods, DETECTION_METHODS, type DetectionMethod, type ComparisonRow } from './evaluation/compare.js';

// Reports, the gate and the config file (`plumb gate`)
export { REPORTERS, REPORT_FORMATS, writeReports, parseFormats, validateReport, formatTerminalSummary, type ReportFormat, type ReportOptions } from './report/index.js';
export { gate, gateDetailed, type GateRunOptions, type GateRun } from './gate-run.js';
export { applySuppressions, evaluateGate, decideGate, loadSuppressions, DEFAULT_GATE_THRESHOLDS, type Suppression, type GateThresholds } from './gate.js';
export { loadConfig, CONFIG_KEYS, type PlumbConfig } from './config.js';

// The demo (`plumb demo`)
export { runDemo, type DemoRunOptions, type DemoResult } from './demo.js';

import type { Finding, FindingKind, Severity } from './findings.js';

/**
 * The result of an audit, a check run or a gate: what every reporter lays out and what
 * `report.json` holds. Reporters are pure functions of this object.
 */

/** One input file as read: enough to tell later whether the same bytes were audited. */
export interface InputInfo {
  path: string;
  format: string;
  bytes: number;
  sha256: string;
  /** Statements seen in this file (accepted + duplicates + rejected). */
  statements: number;
}

/** `read = accepted + duplicates + rejected` holds exactly. */
export interface Accounting {
  read: number;
  accepted: number;
  duplicates: number;
  rejected: number;
}

/** How far the suspect ranking can be trusted on this graph, measured by planting errors in a copy. */
export interface TrustFigure {
  /** Synthetic errors planted in the copy. */
  injected: number;
  /** Average precision of the ranking against the planted errors (random order ≈ the planted share). */
  averagePrecision: number;
  /** Precision among the top K, K = number planted. */
  precisionAtK: number;
  /** The share of errors a random ordering would find at K: the baseline to compare with. */
  baseline: number;
  byKind: Record<string, { injected: number; averagePrecision: number; precisionAtK: number }>;
  /** A sentence for the reader: what the figure means on this graph, including when it is weak. */
  verdict: string;
}

export interface PredicateRow {
  predicate: string;
  triples: number;
  violations: number;
  suspects: number;
}

/** A check that ran, so that reports can list the ones that found nothing too (SARIF rules, JUnit cases). */
export interface CheckInfo {
  /** The id findings carry in `Finding.check`; `model` for the relational model. */
  id: string;
  /** One line: what the check looks for. */
  title: string;
  /** The severity its findings get unless a finding says otherwise. */
  severity: Severity;
}

/** A finding that a suppressions file accepted: it stays out of the gate's counts but not out of the reports. */
export interface SuppressedFinding {
  finding: Finding;
  suppression: { reason: string; expires?: string };
}

export interface GateOutcome {
  passed: boolean;
  /** One line per threshold crossed: `3 errors > --max-errors 0`. */
  crossed: string[];
  thresholds: Record<string, number>;
  suppressed: number;
  expiredSuppressions: number;
}

export interface AuditReport {
  format: 'plumb-report';
  /** Bumped on any incompatible change to this shape; `schemas/report.schema.json` describes it. */
  formatVersion: 1;
  tool: { name: 'plumb'; version: string };
  command: 'audit' | 'check' | 'gate';
  createdAt: string;
  inputs: InputInfo[];
  accounting: Accounting;
  /** The options in force, after defaults and config file. */
  options: Record<string, unknown>;
  seed?: number;
  backend?: string;
  folds?: number;
  /** Seconds per phase: read, checks, fit, score, calibrate, report. */
  durations: Record<string, number>;
  summary: {
    findings: number;
    byKind: Record<FindingKind, number>;
    bySeverity: Record<Severity, number>;
    /** Triples the model scored (0 when no model ran). */
    scored: number;
    trust?: TrustFigure;
  };
  predicates: PredicateRow[];
  /** Counts of scored triples by plausibility in 20 bins of width 0.05, lowest first. */
  plausibilityHistogram?: number[];
  /** Ranked: violations and suspects in one list, gravest and least plausible first. */
  findings: Finding[];
  /** The checks that ran (the model included when it scored), whether or not they found anything. */
  checks?: CheckInfo[];
  /** Findings accepted by the suppressions file; not part of `findings` nor of the summary counts. */
  suppressed?: SuppressedFinding[];
  gate?: GateOutcome;
}

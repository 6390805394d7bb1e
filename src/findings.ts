/**
 * The finding: one record for a syntax error, a constraint violation and a low-plausibility triple,
 * so that one ranked list, one report and one gate serve all three.
 */

/** SARIF 2.1.0's result levels (§3.27.10), in falling order of gravity. */
export type Severity = 'error' | 'warning' | 'note';
export const SEVERITIES: readonly Severity[] = ['error', 'warning', 'note'];

/** `syntax`: a statement that could not be read; `violation`: breaks a declared or mined constraint; `suspect`: the model finds it implausible. */
export type FindingKind = 'syntax' | 'violation' | 'suspect';

export interface SourceLocation {
  file: string;
  line: number;
  column?: number;
}

export interface Finding {
  kind: FindingKind;
  /** The check id (`domain`, `shacl`, `mined-type`, …) or `model` for suspects. */
  check: string;
  severity: Severity;
  /** Term keys (see `src/graph/terms.ts`); empty strings for a syntax finding. */
  subject: string;
  predicate: string;
  object: string;
  /** The named graph, when the triple was read from a quad. */
  graph?: string;
  message: string;
  source?: SourceLocation;
  /** In [0, 1], low is suspect; only where a model scored the triple. */
  plausibility?: number;
  /** 1-based position in the ranked list of suspects. */
  rank?: number;
  /** What a reviewer needs to decide: counts, expected types, preferred alternatives. */
  evidence: Record<string, unknown>;
  /** Index of the triple in the audited graph, when it is one (not serialised by reporters that do not need it). */
  triple?: number;
}

/** Lower is graver: for sorting and for `--fail-on` comparisons. */
export function severityRank(severity: Severity): number {
  return SEVERITIES.indexOf(severity);
}

/** True when `severity` is at or above `threshold` (error ≥ warning ≥ note). */
export function atLeast(severity: Severity, threshold: Severity): boolean {
  return severityRank(severity) <= severityRank(threshold);
}

import type { Finding, Severity, SourceLocation } from '../findings.js';
import type { Graph } from '../graph/store.js';
import type { Schema } from '../schema/index.js';
import type { MinedOptions } from '../schema/mined.js';

/**
 * A check's metadata: its id (= file name = test file name), a title, the severity of its usual
 * finding, a description for `--help` and reports, and its message templates. Templates name their
 * data in braces (`{subject}`); positions travel in the finding's fields, never in the text.
 */
export interface CheckMeta {
  id: string;
  title: string;
  severity: Severity;
  description: string;
  messages: Record<string, string>;
}

/** Options every check may read. */
export interface CheckOptions {
  /**
   * Read a missing type as an error: under RDFS's open world a subject that merely lacks its
   * domain class is only a `warning`, and two values of a functional property only say that OWL
   * would take them to be the same individual.
   */
  closedWorld: boolean;
  /** Thresholds of the mined constraints. */
  mined: MinedOptions;
}

/** What a check reports: a message template and its data, the triple, the evidence. */
export interface ReportInput {
  messageId: string;
  data?: Record<string, string | number>;
  /** The triple the finding is about; fills subject, predicate, object, graph and source unless given. */
  triple?: number;
  subject?: string;
  predicate?: string;
  object?: string;
  severity?: Severity;
  evidence?: Record<string, unknown>;
  /** Where to point the reader when no triple carries a source (a focus node absent from the data). */
  source?: SourceLocation;
}

export interface CheckContext {
  readonly graph: Graph;
  readonly schema: Schema;
  readonly options: CheckOptions;
  /** Builds a finding of this check from a report; the check returns the findings it built. */
  finding(input: ReportInput): Finding;
}

export interface Check {
  meta: CheckMeta;
  run(context: CheckContext): Finding[];
}

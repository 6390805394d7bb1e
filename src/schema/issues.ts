import type { Severity, SourceLocation } from '../findings.js';

/**
 * Something wrong with the schema or the shapes themselves rather than with the data: a subclass
 * cycle, a shape plumb cannot evaluate, an invalid regular expression. The `schema` check turns
 * each into a finding, so nothing in a schema or shapes file is silently ignored.
 */
export interface SchemaIssue {
  severity: Severity;
  /** Stable name of the problem: `subclass-cycle`, `unsupported-shacl`, `malformed-shape`, … */
  code: SchemaIssueCode;
  message: string;
  /** Term keys of the schema triple at fault (the shape, the offending predicate, its value). */
  subject: string;
  predicate: string;
  object: string;
  source?: SourceLocation;
}

export type SchemaIssueCode =
  | 'subclass-cycle'
  | 'subproperty-cycle'
  | 'malformed-axiom'
  | 'unsupported-shacl'
  | 'malformed-shape'
  | 'invalid-pattern';

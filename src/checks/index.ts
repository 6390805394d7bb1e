import { usageError } from '../errors.js';
import type { Finding } from '../findings.js';
import { severityRank } from '../findings.js';
import type { Graph } from '../graph/store.js';
import type { ProgressSink } from '../progress.js';
import type { CheckInfo } from '../result.js';
import type { Schema } from '../schema/index.js';
import { DEFAULT_MINED_OPTIONS } from '../schema/mined.js';
import { asymmetric } from './asymmetric.js';
import { createContext } from './context.js';
import { disjointClasses } from './disjoint-classes.js';
import { domain } from './domain.js';
import { functional } from './functional.js';
import { inverseFunctional } from './inverse-functional.js';
import { irreflexive } from './irreflexive.js';
import { literalLexical } from './literal-lexical.js';
import { literalWhereResource } from './literal-where-resource.js';
import { minedCardinality } from './mined-cardinality.js';
import { minedType } from './mined-type.js';
import { range } from './range.js';
import { resourceWhereLiteral } from './resource-where-literal.js';
import { schema as schemaCheck } from './schema.js';
import { shacl } from './shacl.js';
import type { Check, CheckOptions } from './types.js';

export type { Check, CheckContext, CheckMeta, CheckOptions, ReportInput } from './types.js';

/** Every check, in the order they run. */
export const ALL_CHECKS: readonly Check[] = [
  schemaCheck,
  domain,
  range,
  literalWhereResource,
  resourceWhereLiteral,
  literalLexical,
  functional,
  inverseFunctional,
  disjointClasses,
  irreflexive,
  asymmetric,
  shacl,
  minedType,
  minedCardinality,
];

export const CHECK_IDS: readonly string[] = ALL_CHECKS.map((c) => c.meta.id);

/** Options of {@link runChecks}; everything has a default. */
export interface RunChecksOptions {
  closedWorld?: boolean;
  minSupport?: number;
  minConfidence?: number;
  /** Run only these checks (by id). */
  only?: readonly string[];
  /** Skip these checks (by id); `mined-type` and `mined-cardinality` are the slow ones on large graphs. */
  skip?: readonly string[];
}

export function resolveCheckOptions(options: RunChecksOptions = {}): CheckOptions {
  return {
    closedWorld: options.closedWorld ?? false,
    mined: {
      minSupport: options.minSupport ?? DEFAULT_MINED_OPTIONS.minSupport,
      minConfidence: options.minConfidence ?? DEFAULT_MINED_OPTIONS.minConfidence,
    },
  };
}

/** The checks that {@link runChecks} runs under `options`, for reports that list them. */
export function selectedChecks(options: RunChecksOptions = {}): Check[] {
  for (const id of [...(options.only ?? []), ...(options.skip ?? [])]) {
    if (!CHECK_IDS.includes(id)) throw usageError(`there is no check "${id}"`, `the checks are: ${CHECK_IDS.join(', ')}`);
  }
  const only = options.only ? new Set(options.only) : undefined;
  const skip = new Set(options.skip ?? []);
  return ALL_CHECKS.filter((c) => (!only || only.has(c.meta.id)) && !skip.has(c.meta.id));
}

export function checkInfo(check: Check): CheckInfo {
  return { id: check.meta.id, title: check.meta.title, severity: check.meta.severity };
}

/**
 * Runs the checks over a graph and its schema and returns their findings in a deterministic order:
 * gravest severity first, then check id, then triple index (findings about no triple last), then
 * subject, predicate, object and message.
 */
export function runChecks(graph: Graph, schema: Schema, options: RunChecksOptions = {}, progress?: ProgressSink): Finding[] {
  const resolved = resolveCheckOptions(options);
  const checks = selectedChecks(options);
  const findings: Finding[] = [];
  checks.forEach((check, i) => {
    progress?.({ phase: 'checks', done: i, total: checks.length, detail: check.meta.id });
    for (const f of check.run(createContext(check, graph, schema, resolved))) findings.push(f);
  });
  progress?.({ phase: 'checks', done: checks.length, total: checks.length });
  return sortFindings(findings);
}

export function sortFindings(findings: Finding[]): Finding[] {
  const text = (a: string, b: string): number => (a < b ? -1 : a > b ? 1 : 0);
  return findings.sort(
    (a, b) =>
      severityRank(a.severity) - severityRank(b.severity) ||
      text(a.check, b.check) ||
      (a.triple ?? Number.MAX_SAFE_INTEGER) - (b.triple ?? Number.MAX_SAFE_INTEGER) ||
      text(a.subject, b.subject) ||
      text(a.predicate, b.predicate) ||
      text(a.object, b.object) ||
      text(a.message, b.message),
  );
}

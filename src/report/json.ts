import { Ajv, type ValidateFunction } from 'ajv';
import addFormatsModule from 'ajv-formats';
import type { Finding } from '../findings.js';
import type { AuditReport } from '../result.js';
import reportSchema from '../../schemas/report.schema.json' with { type: 'json' };

/**
 * `report.json`: the whole result, versioned (`format: 'plumb-report'`, `formatVersion: 1`) and
 * described by `schemas/report.schema.json`. Keys come out in a fixed order (the documented fields
 * first, free-form records sorted), each finding on its own line, so that the same report gives the
 * same bytes and two reports diff line by line.
 */

const TOP_LEVEL: readonly (keyof AuditReport)[] = [
  'format',
  'formatVersion',
  'tool',
  'command',
  'createdAt',
  'inputs',
  'accounting',
  'options',
  'seed',
  'backend',
  'folds',
  'durations',
  'summary',
  'predicates',
  'plausibilityHistogram',
  'checks',
  'gate',
  'findings',
  'suppressed',
];

/** A copy of `value` with object keys sorted at every depth; arrays keep their order. */
export function sortKeysDeep(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(sortKeysDeep);
  if (value !== null && typeof value === 'object') {
    const out: Record<string, unknown> = {};
    for (const key of Object.keys(value).sort()) out[key] = sortKeysDeep((value as Record<string, unknown>)[key]);
    return out;
  }
  return value;
}

/** The documented keys first, in the given order; any other key after them, sorted. */
function ordered(value: object, keys: readonly string[]): Record<string, unknown> {
  const source = value as Record<string, unknown>;
  const out: Record<string, unknown> = {};
  for (const key of keys) if (source[key] !== undefined) out[key] = source[key];
  for (const key of Object.keys(source).sort()) if (!(key in out) && source[key] !== undefined) out[key] = source[key];
  return out;
}

/** True when every object inside `value` already has its keys in sorted order (the usual case). */
function keysSorted(value: unknown): boolean {
  if (value === null || typeof value !== 'object') return true;
  if (Array.isArray(value)) return value.every(keysSorted);
  let previous: string | undefined;
  for (const key of Object.keys(value)) {
    if (previous !== undefined && key < previous) return false;
    previous = key;
    if (!keysSorted((value as Record<string, unknown>)[key])) return false;
  }
  return true;
}

/**
 * A finding as report.json holds it, keys in the documented order. `triple` (an index into the
 * in-memory graph) means nothing outside the run that made it, so it is left out.
 */
function findingRecord(f: Finding): Record<string, unknown> {
  return {
    kind: f.kind,
    check: f.check,
    severity: f.severity,
    subject: f.subject,
    predicate: f.predicate,
    object: f.object,
    graph: f.graph,
    message: f.message,
    source: f.source ? { file: f.source.file, line: f.source.line, column: f.source.column } : undefined,
    plausibility: f.plausibility,
    rank: f.rank,
    evidence: keysSorted(f.evidence) ? f.evidence : sortKeysDeep(f.evidence),
  };
}

/**
 * The findings as a JSON array, one per line. One `JSON.stringify` call for the whole list is
 * several times faster than one per finding; the line breaks are then put before each `{"kind":`
 * that follows `},`. That sequence cannot occur inside a JSON string (its quotes would be escaped),
 * so the break always falls between values, where JSON allows whitespace.
 */
function findingLines(findings: readonly Finding[]): string {
  if (findings.length === 0) return '[]';
  const text = JSON.stringify(findings.map(findingRecord));
  return `[\n    ${text.slice(1, -1).replace(/\},\{"kind":/g, '},\n    {"kind":')}\n  ]`;
}

function indentTail(text: string, pad: string): string {
  return text.replace(/\n/g, `\n${pad}`);
}

/** Lays the report out as report.json. */
export function writeJson(report: AuditReport): string {
  const top = ordered(report, TOP_LEVEL as readonly string[]);
  const parts: string[] = [];
  for (const [key, value] of Object.entries(top)) {
    let text: string;
    if (key === 'findings') {
      text = findingLines(report.findings);
    } else if (key === 'suppressed' && report.suppressed) {
      const rows = report.suppressed.map(
        (s) => `    ${JSON.stringify({ finding: findingRecord(s.finding), suppression: ordered(s.suppression, ['reason', 'expires']) })}`,
      );
      text = rows.length === 0 ? '[]' : `[\n${rows.join(',\n')}\n  ]`;
    } else if (key === 'options' || key === 'durations') {
      text = indentTail(JSON.stringify(sortKeysDeep(value), null, 2), '  ');
    } else if (key === 'summary') {
      const summary = ordered(value as object, ['findings', 'byKind', 'bySeverity', 'scored', 'trust']);
      summary.byKind = ordered(summary.byKind as object, ['syntax', 'violation', 'suspect']);
      summary.bySeverity = ordered(summary.bySeverity as object, ['error', 'warning', 'note']);
      if (summary.trust) summary.trust = sortKeysDeep(summary.trust);
      text = indentTail(JSON.stringify(summary, null, 2), '  ');
    } else {
      text = indentTail(JSON.stringify(value, null, 2), '  ');
    }
    parts.push(`  ${JSON.stringify(key)}: ${text}`);
  }
  return `{\n${parts.join(',\n')}\n}\n`;
}

let validator: ValidateFunction | undefined;

function compiled(): ValidateFunction {
  if (!validator) {
    const ajv = new Ajv({ allErrors: true, strict: true });
    // ajv-formats is CommonJS: under NodeNext its default import is the plugin function itself.
    (addFormatsModule as unknown as (ajv: Ajv) => void)(ajv);
    validator = ajv.compile(reportSchema);
  }
  return validator;
}

/**
 * Checks a parsed report.json (or an in-memory report) against `schemas/report.schema.json`.
 * Returns one line per problem, `/findings/3/severity must be equal to one of the allowed values`;
 * an empty list means the report is valid.
 */
export function validateReport(value: unknown): string[] {
  const validate = compiled();
  if (validate(value)) return [];
  return (validate.errors ?? []).map((e) => {
    const where = e.instancePath === '' ? '/' : e.instancePath;
    const extra = e.keyword === 'additionalProperties' ? ` (${String((e.params as { additionalProperty?: string }).additionalProperty)})` : '';
    return `${where} ${e.message ?? 'is invalid'}${extra}`;
  });
}

export { reportSchema };

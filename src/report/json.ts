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

/**
 * JSON text of `value` with object keys sorted at every depth, written directly (no sorted copy is
 * built: 100,000 findings each carry evidence). Values JSON cannot hold are written as
 * `JSON.stringify` writes them.
 */
export function stableStringify(value: unknown): string {
  if (value === null || typeof value !== 'object') return JSON.stringify(value) ?? 'null';
  if (Array.isArray(value)) return `[${value.map((v) => (v === undefined || typeof v === 'function' ? 'null' : stableStringify(v))).join(',')}]`;
  if (typeof (value as { toJSON?: unknown }).toJSON === 'function') return stableStringify((value as { toJSON(): unknown }).toJSON());
  const source = value as Record<string, unknown>;
  const parts: string[] = [];
  for (const key of Object.keys(source).sort()) {
    const v = source[key];
    if (v === undefined || typeof v === 'function') continue;
    parts.push(`${JSON.stringify(key)}:${stableStringify(v)}`);
  }
  return `{${parts.join(',')}}`;
}

/**
 * A finding as report.json holds it, on one line, keys in the documented order. `triple` (an index
 * into the in-memory graph) means nothing outside the run that made it, so it is left out.
 */
export function findingJson(f: Finding): string {
  let out = `{"kind":${JSON.stringify(f.kind)},"check":${JSON.stringify(f.check)},"severity":${JSON.stringify(f.severity)}`;
  out += `,"subject":${JSON.stringify(f.subject)},"predicate":${JSON.stringify(f.predicate)},"object":${JSON.stringify(f.object)}`;
  if (f.graph !== undefined) out += `,"graph":${JSON.stringify(f.graph)}`;
  out += `,"message":${JSON.stringify(f.message)}`;
  if (f.source) {
    out += `,"source":{"file":${JSON.stringify(f.source.file)},"line":${JSON.stringify(f.source.line)}`;
    if (f.source.column !== undefined) out += `,"column":${JSON.stringify(f.source.column)}`;
    out += '}';
  }
  if (f.plausibility !== undefined) out += `,"plausibility":${JSON.stringify(f.plausibility)}`;
  if (f.rank !== undefined) out += `,"rank":${JSON.stringify(f.rank)}`;
  return `${out},"evidence":${stableStringify(f.evidence)}}`;
}

function indentTail(text: string, pad: string): string {
  return text.replace(/\n/g, `\n${pad}`);
}

function findingLines(findings: readonly Finding[]): string {
  if (findings.length === 0) return '[]';
  return `[\n${findings.map((f) => `    ${findingJson(f)}`).join(',\n')}\n  ]`;
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
        (s) => `    {"finding":${findingJson(s.finding)},"suppression":${JSON.stringify(ordered(s.suppression, ['reason', 'expires']))}}`,
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

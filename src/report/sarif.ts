import { createHash } from 'node:crypto';
import type { Finding } from '../findings.js';
import type { AuditReport, CheckInfo } from '../result.js';
import { checksOf, truncate } from './common.js';

/**
 * `report.sarif`: the findings as a SARIF 2.1.0 log (OASIS Standard, "Static Analysis Results
 * Interchange Format (SARIF) Version 2.1.0"), the format code-scanning services read.
 *
 * One run; the driver is plumb, with one rule (reportingDescriptor) per check and one for the model.
 * Each finding is a result: ruleId and ruleIndex name its rule, level is its severity (plumb's
 * severities are SARIF's levels), message.text its message, and its location the input file
 * (artifactLocation.uri) with the line and column where the triple was read (region). Findings a
 * suppressions file accepted are results too, each with an `external` suppression whose
 * justification is the reason given. Term keys, plausibility and rank travel in the result's
 * property bag; a partial fingerprint of the triple and check lets services follow a finding across
 * runs.
 */

/** The OASIS schema location, as the standard's own schema gives its id (SARIF 2.1.0 errata 01). */
export const SARIF_SCHEMA_URI = 'https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json';

/** Terms longer than this are cut in messages; the full term stays in report.json. */
const MAX_MESSAGE = 4000;

/**
 * A relative path becomes a relative URI reference with each segment percent-encoded; an absolute
 * path a `file:` URI. Backslashes are read as separators so that Windows paths come out right.
 */
export function pathToUri(path: string): string {
  const slashed = path.replace(/\\/g, '/');
  const encode = (segment: string): string =>
    encodeURIComponent(segment).replace(/[!'()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
  if (/^[A-Za-z]:\//.test(slashed)) return `file:///${slashed.slice(0, 2)}${slashed.slice(2).split('/').map(encode).join('/')}`;
  if (slashed.startsWith('/')) return `file://${slashed.split('/').map(encode).join('/')}`;
  return slashed.split('/').map(encode).join('/');
}

function rule(check: CheckInfo): Record<string, unknown> {
  return {
    id: check.id,
    name: check.id.replace(/(^|[-_ ])(\w)/g, (_, _sep: string, c: string) => c.toUpperCase()),
    shortDescription: { text: check.title === '' ? check.id : check.title },
    defaultConfiguration: { level: check.severity },
    properties: { tags: [check.id === 'model' ? 'plausibility' : 'constraint'] },
  };
}

function fingerprint(f: Finding): string {
  return createHash('sha256').update(`${f.check}\n${f.subject}\n${f.predicate}\n${f.object}\n${f.graph ?? ''}`).digest('hex');
}

function result(
  f: Finding,
  ruleIndex: Map<string, number>,
  artifactIndex: Map<string, number>,
  uris: Map<string, string>,
  suppression?: { reason: string; expires?: string },
): Record<string, unknown> {
  const out: Record<string, unknown> = {
    ruleId: f.check,
    ruleIndex: ruleIndex.get(f.check) ?? -1,
    kind: 'fail',
    level: f.severity,
    message: { text: truncate(f.message === '' ? `${f.kind} found by ${f.check}` : f.message, MAX_MESSAGE) },
  };
  if (f.source) {
    const region: Record<string, number> = {};
    // SARIF lines and columns are 1-based (§3.30.5, §3.30.6); a reader that could not tell gives 0.
    if (f.source.line >= 1) region.startLine = f.source.line;
    if (f.source.line >= 1 && f.source.column !== undefined && f.source.column >= 1) region.startColumn = f.source.column;
    let uri = uris.get(f.source.file);
    if (uri === undefined) uris.set(f.source.file, (uri = pathToUri(f.source.file)));
    const artifactLocation: Record<string, unknown> = { uri };
    const index = artifactIndex.get(f.source.file);
    if (index !== undefined) artifactLocation.index = index;
    const physicalLocation: Record<string, unknown> = { artifactLocation };
    if (region.startLine !== undefined) physicalLocation.region = region;
    out.locations = [{ physicalLocation }];
  }
  out.partialFingerprints = { 'plumbTriple/v1': fingerprint(f) };
  const properties: Record<string, unknown> = { kind: f.kind, subject: f.subject, predicate: f.predicate, object: f.object };
  if (f.graph !== undefined) properties.graph = f.graph;
  if (f.plausibility !== undefined) properties.plausibility = f.plausibility;
  if (f.rank !== undefined) properties.suspectRank = f.rank;
  out.properties = properties;
  if (suppression) {
    out.suppressions = [
      {
        kind: 'external',
        status: 'accepted',
        justification: suppression.expires ? `${suppression.reason} (until ${suppression.expires})` : suppression.reason,
      },
    ];
  }
  return out;
}

/** Lays the report out as a SARIF 2.1.0 log. */
export function writeSarif(report: AuditReport): string {
  const checks = checksOf(report);
  const ruleIndex = new Map(checks.map((c, i) => [c.id, i]));
  const artifacts = report.inputs.map((input) => ({
    location: { uri: pathToUri(input.path) },
    length: input.bytes,
    roles: ['analysisTarget'],
    hashes: { 'sha-256': input.sha256 },
  }));
  const artifactIndex = new Map(report.inputs.map((input, i) => [input.path, i]));
  const uris = new Map<string, string>();
  const results = [
    ...report.findings.map((f) => result(f, ruleIndex, artifactIndex, uris)),
    ...(report.suppressed ?? []).map((s) => result(s.finding, ruleIndex, artifactIndex, uris, s.suppression)),
  ];
  const invocation: Record<string, unknown> = {
    executionSuccessful: true,
    endTimeUtc: report.createdAt,
  };
  if (report.gate) {
    invocation.properties = { gatePassed: report.gate.passed, crossed: report.gate.crossed };
  }
  const run = {
    tool: {
      driver: {
        name: report.tool.name,
        version: report.tool.version,
        semanticVersion: report.tool.version,
        rules: checks.map(rule),
      },
    },
    invocations: [invocation],
    artifacts,
    // Columns come from JavaScript string offsets in the readers.
    columnKind: 'utf16CodeUnits',
    properties: {
      command: report.command,
      formatVersion: report.formatVersion,
      scored: report.summary.scored,
      note: 'Findings are candidates for review, not verdicts.',
    },
  };
  // Results go one per line, like the findings in report.json: a 100,000-result log stays a size
  // that tools load, and two logs diff line by line.
  const runText = JSON.stringify(run, null, 2).replace(/\n/g, '\n    ');
  // One stringify for all results, then a break before each `{"ruleId":` after `},`: that sequence
  // cannot occur inside a JSON string, so the breaks fall between values.
  const resultsText =
    results.length === 0
      ? '[]'
      : `[\n        ${JSON.stringify(results).slice(1, -1).replace(/\},\{"ruleId":/g, '},\n        {"ruleId":')}\n      ]`;
  const runWithResults = `${runText.slice(0, runText.lastIndexOf('\n'))},\n      "results": ${resultsText}\n    }`;
  return `{\n  "$schema": ${JSON.stringify(SARIF_SCHEMA_URI)},\n  "version": "2.1.0",\n  "runs": [\n    ${runWithResults}\n  ]\n}\n`;
}

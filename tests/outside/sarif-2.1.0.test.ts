import { describe, expect, it } from 'vitest';
import { Ajv } from 'ajv';
import addFormatsModule from 'ajv-formats';
import { SARIF_SCHEMA_URI, pathToUri, writeSarif } from '../../src/report/sarif.js';
import { finding, makeReport, manyFindings } from '../report/make-report.js';

/**
 * report.sarif against the OASIS Standard "Static Analysis Results Interchange Format (SARIF)
 * Version 2.1.0" (with Errata 01). No npm package at hand ships the official JSON schema, so every
 * property the standard marks required, and every constrained value plumb writes, is checked here
 * field by field. Source: OASIS SARIF 2.1.0 and its schema sarif-schema-2.1.0.json (the schema's
 * top-level `required: ["version", "runs"]` was read from the OASIS repository; the section numbers
 * beside each check and the other required lists are from memory of the standard's text).
 */

type Json = Record<string, unknown>;

const ajv = new Ajv({ strict: false });
(addFormatsModule as unknown as (a: Ajv) => void)(ajv);
const isUriReference = ajv.compile({ type: 'string', format: 'uri-reference' });
const isUri = ajv.compile({ type: 'string', format: 'uri' });
const isDateTime = ajv.compile({ type: 'string', format: 'date-time' });

const LEVELS = ['none', 'note', 'warning', 'error'];

function obj(value: unknown): value is Json {
  return value !== null && typeof value === 'object' && !Array.isArray(value);
}

/** Every problem found, as `path: what the standard requires`. */
function sarifProblems(log: unknown): string[] {
  const problems: string[] = [];
  const need = (ok: boolean, where: string, rule: string): void => {
    if (!ok) problems.push(`${where}: ${rule}`);
  };
  const message = (m: unknown, where: string): void => {
    // §3.11: a message object has text (§3.11.8) or id (§3.11.10), at least one.
    need(obj(m) && (typeof m.text === 'string' || typeof m.id === 'string'), where, '§3.11 message needs text or id');
  };
  const multiformat = (m: unknown, where: string): void => {
    // §3.12.3: multiformatMessageString.text is required.
    need(obj(m) && typeof m.text === 'string', where, '§3.12.3 multiformatMessageString.text is required');
  };
  const propertyBag = (p: unknown, where: string): void => {
    // §3.8: a property bag is an object; its tags (§3.8.2) are unique strings.
    need(obj(p), where, '§3.8 properties is an object');
    if (obj(p) && p.tags !== undefined) {
      need(Array.isArray(p.tags) && p.tags.every((t) => typeof t === 'string') && new Set(p.tags).size === p.tags.length, `${where}.tags`, '§3.8.2 tags are unique strings');
    }
  };

  need(obj(log), '$', '§3.13 the log is a JSON object');
  if (!obj(log)) return problems;
  // §3.13.2 version is required and is "2.1.0".
  need(log.version === '2.1.0', '$.version', '§3.13.2 version is required and equals "2.1.0"');
  // §3.13.3 $schema, when present, is an absolute URI.
  if (log.$schema !== undefined) need(isUri(log.$schema) as boolean, '$.$schema', '§3.13.3 $schema is a URI');
  // §3.13.4 runs is required: an array of run objects.
  need(Array.isArray(log.runs), '$.runs', '§3.13.4 runs is required and is an array');
  const runs = Array.isArray(log.runs) ? log.runs : [];
  runs.forEach((run: unknown, r) => {
    const at = `$.runs[${r}]`;
    need(obj(run), at, '§3.14 a run is an object');
    if (!obj(run)) return;
    // §3.14.6 tool is required; §3.18.2 tool.driver is required; §3.19.8 toolComponent.name is required.
    need(obj(run.tool), `${at}.tool`, '§3.14.6 run.tool is required');
    const tool = obj(run.tool) ? run.tool : {};
    need(obj(tool.driver), `${at}.tool.driver`, '§3.18.2 tool.driver is required');
    const driver = obj(tool.driver) ? tool.driver : {};
    need(typeof driver.name === 'string' && driver.name.length > 0, `${at}.tool.driver.name`, '§3.19.8 toolComponent.name is required');
    if (driver.version !== undefined) need(typeof driver.version === 'string', `${at}.tool.driver.version`, '§3.19.13 version is a string');
    if (driver.semanticVersion !== undefined) {
      need(typeof driver.semanticVersion === 'string' && /^\d+\.\d+\.\d+/.test(driver.semanticVersion), `${at}.tool.driver.semanticVersion`, '§3.19.14 semanticVersion is a Semantic Versioning 2.0 string');
    }
    // §3.19.23 rules: reportingDescriptor objects; §3.49.3 id is required; ids are unique within the component.
    const rules = Array.isArray(driver.rules) ? (driver.rules as unknown[]) : [];
    if (driver.rules !== undefined) need(Array.isArray(driver.rules), `${at}.tool.driver.rules`, '§3.19.23 rules is an array');
    const ids = new Set<string>();
    rules.forEach((rule, i) => {
      const rat = `${at}.tool.driver.rules[${i}]`;
      need(obj(rule) && typeof rule.id === 'string' && rule.id.length > 0, `${rat}.id`, '§3.49.3 reportingDescriptor.id is required');
      if (!obj(rule)) return;
      need(!ids.has(rule.id as string), `${rat}.id`, '§3.19.23 rule ids are unique');
      ids.add(rule.id as string);
      if (rule.shortDescription !== undefined) multiformat(rule.shortDescription, `${rat}.shortDescription`);
      if (rule.fullDescription !== undefined) multiformat(rule.fullDescription, `${rat}.fullDescription`);
      if (rule.defaultConfiguration !== undefined) {
        const dc = rule.defaultConfiguration;
        need(obj(dc) && (dc.level === undefined || LEVELS.includes(dc.level as string)), `${rat}.defaultConfiguration.level`, '§3.50.3 level is none, note, warning or error');
      }
      if (rule.properties !== undefined) propertyBag(rule.properties, `${rat}.properties`);
    });
    // §3.20.14 invocation.executionSuccessful is required; §3.20.8 endTimeUtc is a UTC date-time (§3.9).
    const invocations = Array.isArray(run.invocations) ? (run.invocations as unknown[]) : [];
    invocations.forEach((inv, i) => {
      need(obj(inv) && typeof inv.executionSuccessful === 'boolean', `${at}.invocations[${i}].executionSuccessful`, '§3.20.14 executionSuccessful is required');
      if (obj(inv) && inv.endTimeUtc !== undefined) {
        need(isDateTime(inv.endTimeUtc) as boolean && String(inv.endTimeUtc).endsWith('Z'), `${at}.invocations[${i}].endTimeUtc`, '§3.9 times are UTC ISO 8601');
      }
    });
    // §3.24 artifacts: location is an artifactLocation (§3.4) whose uri (§3.4.3) is a URI reference; length ≥ -1 (§3.24.10).
    const artifacts = Array.isArray(run.artifacts) ? (run.artifacts as unknown[]) : [];
    artifacts.forEach((a, i) => {
      const aat = `${at}.artifacts[${i}]`;
      need(obj(a) && obj(a.location) && isUriReference((a.location as Json).uri) as boolean, `${aat}.location.uri`, '§3.4.3 uri is a valid URI reference');
      if (obj(a) && a.length !== undefined) need(Number.isInteger(a.length) && (a.length as number) >= -1, `${aat}.length`, '§3.24.10 length is an integer ≥ -1');
      if (obj(a) && a.hashes !== undefined) need(obj(a.hashes) && Object.values(a.hashes).every((h) => typeof h === 'string'), `${aat}.hashes`, '§3.24.11 hashes map names to strings');
    });
    if (run.columnKind !== undefined) need(['utf16CodeUnits', 'unicodeCodePoints'].includes(run.columnKind as string), `${at}.columnKind`, '§3.14.14 columnKind is utf16CodeUnits or unicodeCodePoints');
    if (run.properties !== undefined) propertyBag(run.properties, `${at}.properties`);
    // §3.14.23 results: an array of result objects.
    need(Array.isArray(run.results), `${at}.results`, '§3.14.23 results is an array (present, as the run analysed something)');
    const results = Array.isArray(run.results) ? (run.results as unknown[]) : [];
    results.forEach((res, i) => {
      const rat = `${at}.results[${i}]`;
      need(obj(res), rat, '§3.27 a result is an object');
      if (!obj(res)) return;
      // §3.27.11 message is required.
      need(res.message !== undefined, `${rat}.message`, '§3.27.11 result.message is required');
      message(res.message, `${rat}.message`);
      // §3.27.5 ruleId; §3.27.6 ruleIndex indexes tool.driver.rules and, with ruleId, names the same rule.
      if (res.ruleId !== undefined) need(typeof res.ruleId === 'string', `${rat}.ruleId`, '§3.27.5 ruleId is a string');
      if (res.ruleIndex !== undefined) {
        const idx = res.ruleIndex as number;
        need(Number.isInteger(idx) && idx >= -1, `${rat}.ruleIndex`, '§3.27.6 ruleIndex is an integer ≥ -1');
        if (idx >= 0) need(obj(rules[idx]) && (rules[idx] as Json).id === res.ruleId, `${rat}.ruleIndex`, '§3.27.6 ruleIndex points at the rule named by ruleId');
      }
      // §3.27.10 level; §3.27.9 kind, and a kind other than fail goes with level none.
      if (res.level !== undefined) need(LEVELS.includes(res.level as string), `${rat}.level`, '§3.27.10 level is none, note, warning or error');
      if (res.kind !== undefined) {
        need(['notApplicable', 'pass', 'fail', 'review', 'open', 'informational'].includes(res.kind as string), `${rat}.kind`, '§3.27.9 kind is one of the six values');
        if (res.kind !== 'fail' && res.level !== undefined) need(res.level === 'none', `${rat}.level`, '§3.27.10 level is none unless kind is fail');
      }
      // §3.27.12 locations; §3.28.3 physicalLocation; §3.29 it has an artifactLocation (§3.29.3) or an address;
      // §3.29.4 region; §3.30.5/§3.30.6 startLine and startColumn are integers ≥ 1.
      if (res.locations !== undefined) {
        need(Array.isArray(res.locations), `${rat}.locations`, '§3.27.12 locations is an array');
        (Array.isArray(res.locations) ? (res.locations as unknown[]) : []).forEach((loc, j) => {
          const lat = `${rat}.locations[${j}]`;
          need(obj(loc), lat, '§3.28 a location is an object');
          if (!obj(loc) || loc.physicalLocation === undefined) return;
          const pl = loc.physicalLocation;
          need(obj(pl) && (obj(pl.artifactLocation) || obj(pl.address)), `${lat}.physicalLocation`, '§3.29 physicalLocation has an artifactLocation or an address');
          if (!obj(pl) || !obj(pl.artifactLocation)) return;
          const al = pl.artifactLocation;
          need(isUriReference(al.uri) as boolean, `${lat}.physicalLocation.artifactLocation.uri`, '§3.4.3 uri is a valid URI reference');
          if (al.index !== undefined) {
            const a = artifacts[al.index as number];
            need(obj(a) && obj(a.location) && (a.location as Json).uri === al.uri, `${lat}.physicalLocation.artifactLocation.index`, '§3.4.5 index points at the artifact with the same uri');
          }
          if (pl.region !== undefined) {
            const rg = pl.region;
            need(obj(rg), `${lat}.physicalLocation.region`, '§3.30 region is an object');
            if (!obj(rg)) return;
            if (rg.startLine !== undefined) need(Number.isInteger(rg.startLine) && (rg.startLine as number) >= 1, `${lat}.physicalLocation.region.startLine`, '§3.30.5 startLine is an integer ≥ 1');
            if (rg.startColumn !== undefined) need(Number.isInteger(rg.startColumn) && (rg.startColumn as number) >= 1, `${lat}.physicalLocation.region.startColumn`, '§3.30.6 startColumn is an integer ≥ 1');
            need(rg.startLine !== undefined || rg.charOffset !== undefined || rg.byteOffset !== undefined, `${lat}.physicalLocation.region`, '§3.30.2 a text region starts somewhere');
          }
        });
      }
      // §3.27.16 partialFingerprints map strings to strings.
      if (res.partialFingerprints !== undefined) {
        need(obj(res.partialFingerprints) && Object.values(res.partialFingerprints).every((v) => typeof v === 'string'), `${rat}.partialFingerprints`, '§3.27.16 partialFingerprints values are strings');
      }
      // §3.27.23 suppressions; §3.35.3 kind is required (inSource or external); §3.35.4 status; §3.35.6 justification.
      if (res.suppressions !== undefined) {
        need(Array.isArray(res.suppressions), `${rat}.suppressions`, '§3.27.23 suppressions is an array');
        (Array.isArray(res.suppressions) ? (res.suppressions as unknown[]) : []).forEach((s, j) => {
          const sat = `${rat}.suppressions[${j}]`;
          need(obj(s) && ['inSource', 'external'].includes(s.kind as string), `${sat}.kind`, '§3.35.3 suppression.kind is required: inSource or external');
          if (obj(s) && s.status !== undefined) need(['accepted', 'underReview', 'rejected'].includes(s.status as string), `${sat}.status`, '§3.35.4 status is accepted, underReview or rejected');
          if (obj(s) && s.justification !== undefined) need(typeof s.justification === 'string', `${sat}.justification`, '§3.35.6 justification is a string');
        });
      }
      if (res.properties !== undefined) propertyBag(res.properties, `${rat}.properties`);
    });
  });
  return problems;
}

function richReport() {
  const noSource = finding({ check: 'shacl', severity: 'note', message: '' });
  delete noSource.source;
  return makeReport(
    [
      ...manyFindings(40),
      finding({ source: { file: '/srv/graphs/orchard data.ttl', line: 4, column: 9 } }),
      finding({ source: { file: 'C:\\graphs\\ünïcode #1.nt', line: 2 } }),
      finding({ kind: 'syntax', check: 'syntax', subject: '', predicate: '', object: '', message: 'expected "." after the object', source: { file: 'data/orchard.ttl', line: 0 } }),
      noSource,
    ],
    {
      suppressed: [{ finding: finding({ check: 'domain', message: 'accepted one' }), suppression: { reason: 'legacy plots, ticket 12', expires: '2031-01-31' } }],
    },
  );
}

describe('report.sarif against SARIF 2.1.0 (OASIS)', () => {
  it('meets every required property, field by field', () => {
    const log = JSON.parse(writeSarif(richReport())) as Json;
    expect(sarifProblems(log)).toEqual([]);
    // Source: the schema's id in the OASIS repository (errata01 os schemas).
    expect(log.$schema).toBe(SARIF_SCHEMA_URI);
  });

  it('the checker itself catches what the standard forbids', () => {
    const log = JSON.parse(writeSarif(richReport())) as { runs: { results: Json[]; tool: { driver: Json } }[]; version: string };
    const bad = structuredClone(log);
    bad.version = '2.0.0';
    const result = bad.runs[0]!.results[0]!;
    result.message = {};
    result.level = 'fatal';
    (result.locations as { physicalLocation: { region: Json } }[])[0]!.physicalLocation.region.startLine = 0;
    delete bad.runs[0]!.tool.driver.name;
    const problems = sarifProblems(bad).join('\n');
    for (const section of ['§3.13.2', '§3.11', '§3.27.10', '§3.30.5', '§3.19.8']) expect(problems).toContain(section);
  });

  it('has one rule per check and one for the model, each result naming its rule, level and location', () => {
    const report = richReport();
    const log = JSON.parse(writeSarif(report)) as {
      runs: { tool: { driver: { rules: { id: string; defaultConfiguration: { level: string } }[] } }; results: Json[]; artifacts: Json[] }[];
    };
    const run = log.runs[0]!;
    const ruleIds = run.tool.driver.rules.map((r) => r.id);
    expect(ruleIds).toEqual([...new Set(ruleIds)].sort());
    expect(ruleIds).toContain('model');
    for (const id of new Set(report.findings.map((f) => f.check))) expect(ruleIds).toContain(id);
    expect(run.results).toHaveLength(report.findings.length + 1);
    report.findings.forEach((f, i) => {
      const r = run.results[i] as { ruleId: string; level: string; message: { text: string }; locations?: { physicalLocation: { artifactLocation: { uri: string }; region?: { startLine: number; startColumn?: number } } }[] };
      expect(r.ruleId).toBe(f.check);
      expect(r.level).toBe(f.severity);
      if (f.message !== '') expect(r.message.text).toBe(f.message);
      if (f.source && f.source.line >= 1) {
        expect(r.locations![0]!.physicalLocation.region!.startLine).toBe(f.source.line);
        if (f.source.column !== undefined) expect(r.locations![0]!.physicalLocation.region!.startColumn).toBe(f.source.column);
      }
      if (!f.source) expect(r.locations).toBeUndefined();
    });
    expect(run.artifacts).toHaveLength(report.inputs.length);
  });

  it('carries suppressed findings with an external suppression whose justification is the reason', () => {
    const log = JSON.parse(writeSarif(richReport())) as { runs: { results: { message: { text: string }; suppressions?: Json[] }[] }[] };
    const suppressed = log.runs[0]!.results.filter((r) => r.suppressions);
    expect(suppressed).toHaveLength(1);
    expect(suppressed[0]!.message.text).toBe('accepted one');
    expect(suppressed[0]!.suppressions).toEqual([{ kind: 'external', status: 'accepted', justification: 'legacy plots, ticket 12 (until 2031-01-31)' }]);
  });

  it('writes file paths as URI references (RFC 3986): encoded, relative stays relative', () => {
    expect(pathToUri('data/harvest log.nt')).toBe('data/harvest%20log.nt');
    expect(pathToUri('/srv/a#b/c?.ttl')).toBe('file:///srv/a%23b/c%3F.ttl');
    expect(pathToUri('C:\\graphs\\x y.nt')).toBe('file:///C:/graphs/x%20y.nt');
    for (const p of ['data/harvest log.nt', '/srv/ü/[x].ttl', 'C:\\a\\b c', '-', "it's (1).ttl"]) expect(isUriReference(pathToUri(p))).toBe(true);
  });

  it('is byte-identical for the same report, one result per line', () => {
    const text = writeSarif(richReport());
    expect(text).toBe(writeSarif(richReport()));
    const results = (JSON.parse(text) as { runs: { results: unknown[] }[] }).runs[0]!.results;
    expect(text.split('\n').filter((l) => l.trimStart().startsWith('{"ruleId"'))).toHaveLength(results.length);
  });
});

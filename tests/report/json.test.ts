import { describe, expect, it } from 'vitest';
import { Ajv } from 'ajv';
import addFormatsModule from 'ajv-formats';
import schema from '../../schemas/report.schema.json' with { type: 'json' };
import { validateReport, writeJson } from '../../src/report/json.js';
import { finding, makeReport, manyFindings } from './make-report.js';

function schemaErrors(value: unknown): unknown[] {
  // A second, independent compile of the shipped schema, so the test does not only trust validateReport.
  const ajv = new Ajv({ allErrors: true, strict: true });
  (addFormatsModule as unknown as (a: Ajv) => void)(ajv);
  const validate = ajv.compile(schema);
  return validate(value) ? [] : (validate.errors ?? []);
}

describe('report.json', () => {
  it('writes a versioned report that its shipped JSON Schema accepts', () => {
    const report = makeReport(manyFindings(200), {
      suppressed: [{ finding: finding({ check: 'domain' }), suppression: { reason: 'legacy plots, tracked in ticket 12', expires: '2031-01-31' } }],
      gate: { passed: false, crossed: ['3 errors > --max-errors 0'], thresholds: { maxErrors: 0 }, suppressed: 1, expiredSuppressions: 0 },
    });
    const parsed = JSON.parse(writeJson(report)) as Record<string, unknown>;
    expect(parsed.format).toBe('plumb-report');
    expect(parsed.formatVersion).toBe(1);
    expect(schemaErrors(parsed)).toEqual([]);
    expect(validateReport(parsed)).toEqual([]);
    expect((parsed.findings as unknown[]).length).toBe(200);
  });

  it('gives byte-identical output for the same report, whatever order its free-form keys were built in', () => {
    const a = makeReport(manyFindings(50), { options: { seed: 7, folds: 5, out: 'reports' }, durations: { read: 1, fit: 2 } });
    const b = makeReport(manyFindings(50), { options: { out: 'reports', folds: 5, seed: 7 }, durations: { fit: 2, read: 1 } });
    b.findings = b.findings.map((f) => ({ ...f, evidence: Object.fromEntries(Object.entries(f.evidence).reverse()) }));
    expect(writeJson(a)).toBe(writeJson(b));
    expect(writeJson(a)).toBe(writeJson(a));
  });

  it('puts each finding on its own line and leaves out the in-memory triple index', () => {
    const report = makeReport([finding({ triple: 41 }), finding({ subject: 'http://example.org/orchard/tree/2' })]);
    const text = writeJson(report);
    const lines = text.split('\n').filter((l) => l.trimStart().startsWith('{"kind"'));
    expect(lines).toHaveLength(2);
    expect(text).not.toContain('"triple"');
  });

  it('stays valid JSON when evidence holds objects that look like findings', () => {
    const evidence = { related: [{ kind: 'violation', check: 'x' }, { kind: 'suspect' }], note: '},{"kind":' };
    const report = makeReport([finding({ evidence }), finding()]);
    const parsed = JSON.parse(writeJson(report)) as { findings: { evidence: unknown }[] };
    expect(parsed.findings[0]!.evidence).toEqual(evidence);
    expect(validateReport(parsed)).toEqual([]);
  });

  it('keeps strings exactly, however odd', () => {
    const odd = '"<script>alert(1)</script> \u2028 \u202e עברית e\u0301"@he';
    const report = makeReport([finding({ object: odd, message: 'line1\nline2\u0000' })]);
    const parsed = JSON.parse(writeJson(report)) as { findings: { object: string; message: string }[] };
    expect(parsed.findings[0]!.object).toBe(odd);
    expect(parsed.findings[0]!.message).toBe('line1\nline2\u0000');
  });

  it('reports where a report breaks the schema', () => {
    const report = makeReport([finding()]) as unknown as Record<string, unknown>;
    const broken = JSON.parse(writeJson(report as never)) as Record<string, unknown>;
    (broken.findings as Record<string, unknown>[])[0]!.severity = 'fatal';
    broken.formatVersion = 2;
    broken.surprise = true;
    const errors = validateReport(broken);
    expect(errors.some((e) => e.startsWith('/findings/0/severity'))).toBe(true);
    expect(errors.some((e) => e.startsWith('/formatVersion'))).toBe(true);
    expect(errors.some((e) => e.includes('(surprise)'))).toBe(true);
    expect(schemaErrors(broken).length).toBeGreaterThan(0);
  });
});

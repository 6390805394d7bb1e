import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadConfig } from '../src/config.js';
import { PlumbError } from '../src/errors.js';
import type { Finding } from '../src/findings.js';
import {
  DEFAULT_GATE_THRESHOLDS,
  applySuppressions,
  decideGate,
  evaluateGate,
  gateExitCode,
  isExpired,
  loadSuppressions,
  normaliseTerm,
  type GateThresholds,
  type Suppression,
} from '../src/gate.js';
import { finding } from './report/make-report.js';

const EX = 'http://example.org/orchard/';
const today = new Date('2024-06-15T12:00:00Z');

const error = finding({ subject: `${EX}tree/9`, check: 'range', severity: 'error' });
const suspect = finding({ kind: 'suspect', check: 'model', severity: 'warning', subject: `${EX}tree/4`, plausibility: 0.012, rank: 1 });
const note = finding({ check: 'datatype', severity: 'note', subject: `${EX}tree/5` });

function suppress(f: Finding, extra: Partial<Suppression> = {}): Suppression {
  return { subject: `<${f.subject}>`, predicate: f.predicate, object: f.object, check: f.check, reason: 'reviewed: grafted tree, plot recorded late', ...extra };
}

/** The whole gate decision as `plumb gate` makes it: suppressions, then thresholds, then the exit code. */
function gate(findings: Finding[], suppressions: Suppression[], thresholds: GateThresholds = {}) {
  const decided = decideGate(findings, suppressions, thresholds, today);
  // decideGate is the composition of the three steps; check it against doing them by hand.
  const s = applySuppressions(findings, suppressions, today);
  const outcome = evaluateGate(s.active, { ...DEFAULT_GATE_THRESHOLDS, ...thresholds }, { suppressed: s.suppressed.length, expiredSuppressions: s.expired.length });
  expect(decided.outcome).toEqual(outcome);
  expect(decided.exitCode).toBe(gateExitCode(outcome));
  return { ...decided, exit: decided.exitCode };
}

describe('the gate', () => {
  it('lets a threshold given override the default, and passes with none crossed', () => {
    expect(gate([error], [], { maxErrors: 1 }).exit).toBe(0);
    expect(gate([error, error], [], { maxErrors: 1 }).outcome.crossed).toEqual(['2 errors > --max-errors 1']);
  });

  it('passes clean incoming triples (exit 0)', () => {
    const g = gate([], []);
    expect(g.exit).toBe(0);
    expect(g.outcome).toEqual({ passed: true, crossed: [], thresholds: { maxErrors: 0 }, suppressed: 0, expiredSuppressions: 0 });
    // Notes alone do not cross the default thresholds.
    expect(gate([note], []).exit).toBe(0);
  });

  it('fails incoming triples with an error (exit 1), saying which threshold was crossed', () => {
    const g = gate([error, note], []);
    expect(g.exit).toBe(1);
    expect(g.outcome.crossed).toEqual(['1 error > --max-errors 0']);
  });

  it('passes when every error is suppressed, and keeps the suppressed ones for the reports', () => {
    const g = gate([error, note], [suppress(error, { expires: '2024-06-15' })]);
    expect(g.exit).toBe(0);
    expect(g.active).toEqual([note]);
    expect(g.suppressed).toEqual([{ finding: error, suppression: { reason: 'reviewed: grafted tree, plot recorded late', expires: '2024-06-15' } }]);
    expect(g.outcome.suppressed).toBe(1);
  });

  it('brings a finding back when its suppression expired, with a note, and fails on it', () => {
    const g = gate([error], [suppress(error, { expires: '2024-06-14' })]);
    expect(g.exit).toBe(1);
    expect(g.expired).toHaveLength(1);
    expect(g.active[0]!.message).toContain('its suppression expired on 2024-06-14');
    expect(g.active[0]!.evidence.suppression).toEqual({ expired: '2024-06-14', reason: 'reviewed: grafted tree, plot recorded late' });
    expect(g.outcome.expiredSuppressions).toBe(1);
    // The expiry day itself still holds (UTC).
    expect(isExpired(suppress(error, { expires: '2024-06-15' }), new Date('2024-06-15T23:59:59Z'))).toBe(false);
    expect(isExpired(suppress(error, { expires: '2024-06-15' }), new Date('2024-06-16T00:00:00Z'))).toBe(true);
  });

  it('matches by triple and check only, and lists suppressions that matched nothing', () => {
    const other = suppress(error, { check: 'domain' });
    const g = gate([error], [other]);
    expect(g.exit).toBe(1);
    expect(g.unused).toEqual([other]);
    expect(normaliseTerm(' <http://x> ')).toBe('http://x');
    expect(normaliseTerm('"<b>"')).toBe('"<b>"');
  });

  it('checks each threshold given, and only those', () => {
    const findings = [error, suspect, note, finding({ kind: 'suspect', check: 'model', severity: 'note', plausibility: 0.3 })];
    const outcome = evaluateGate(findings, { maxErrors: 1, maxWarnings: 0, maxSuspects: 1, minPlausibility: 0.05 });
    expect(outcome.crossed).toEqual(['1 warning > --max-warnings 0', '2 suspects > --max-suspects 1', '1 triple below --min-plausibility 0.05 (lowest 0.012)']);
    expect(outcome.thresholds).toEqual({ maxErrors: 1, maxWarnings: 0, maxSuspects: 1, minPlausibility: 0.05 });
    expect(evaluateGate(findings, {}).passed).toBe(true);
  });

  it('refuses thresholds that make no sense', () => {
    expect(() => evaluateGate([], { maxErrors: -1 })).toThrowError(/--max-errors must be a whole number/);
    expect(() => evaluateGate([], { maxSuspects: 1.5 })).toThrowError(PlumbError);
    expect(() => evaluateGate([], { minPlausibility: 2 })).toThrowError(/between 0 and 1/);
  });

  it('stops on a malformed config with a PlumbError that exits 2', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'plumb-gate-'));
    writeFileSync(join(dir, 'plumb.config.json'), '{ "maxErrors": 0, "maxSuspect": 3 }');
    const failure = await loadConfig(undefined, dir).catch((e: unknown) => e);
    expect(failure).toBeInstanceOf(PlumbError);
    expect((failure as PlumbError).exitCode).toBe(2);
    expect((failure as PlumbError).message).toContain('"maxSuspect"');
  });
});

describe('loadSuppressions', () => {
  const file = (text: string): string => {
    const path = join(mkdtempSync(join(tmpdir(), 'plumb-supp-')), 'accepted.json');
    writeFileSync(path, text);
    return path;
  };

  it('reads a list of suppressions', async () => {
    const list = [suppress(error, { expires: '2025-01-31' }), suppress(note)];
    expect(await loadSuppressions(file(JSON.stringify(list, null, 2)))).toEqual(list);
  });

  it('names the file and line of a JSON syntax error', async () => {
    const err = (await loadSuppressions(file('[\n  {"subject": "a",\n   "reason": "x",}\n]')).catch((e: unknown) => e)) as PlumbError;
    expect(err.code).toBe('E_INPUT');
    expect(err.position).toMatchObject({ line: 3 });
    expect(err.message).toContain('accepted.json is not valid JSON');
  });

  it('names the entry, its line and what it lacks', async () => {
    const good = JSON.stringify(suppress(error));
    const text = `[\n  ${good},\n  ${good},\n  {"subject": "a", "predicate": "b", "object": "c", "check": "range"}\n]`;
    const err = (await loadSuppressions(file(text)).catch((e: unknown) => e)) as PlumbError;
    expect(err.message).toContain('suppression 3 lacks "reason"');
    expect(err.position?.line).toBe(4);
    const badDate = (await loadSuppressions(file(JSON.stringify([suppress(error, { expires: '2024-02-30' })]))).catch((e: unknown) => e)) as PlumbError;
    expect(badDate.message).toContain('2024-02-30, which is not a date');
    const notList = (await loadSuppressions(file('{"subject": "a"}')).catch((e: unknown) => e)) as PlumbError;
    expect(notList.message).toContain('must hold a JSON list');
    const missing = (await loadSuppressions('/nonexistent/accepted.json').catch((e: unknown) => e)) as PlumbError;
    expect(missing.message).toContain('no such file');
    expect(missing.exitCode).toBe(2);
  });
});

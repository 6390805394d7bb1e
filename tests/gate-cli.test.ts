import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { readGraph } from '../src/sources/index.js';
import { fit } from '../src/model/index.js';
import { validateReport } from '../src/report/index.js';
import type { AuditReport } from '../src/result.js';
import { runCli } from './helpers/cli.js';

/**
 * `plumb gate` through the CLI, in-process, on small graphs written to a temp folder: exit codes
 * (DESIGN.md: 0 passed, 1 a threshold crossed, 2 bad usage or unreadable input), suppressions, the
 * config file, and the reports it leaves. The model is left out (--no-model) except in one test
 * that gates with a tiny saved model. That reports are written atomically (a killed run leaves the
 * old file or the whole new one, never a truncated one) is tested in tests/report/write-reports.test.ts
 * with a child process killed mid-write; here only that a gate leaves no partial file behind.
 */

const EX = 'http://example.org/orchard/';
const RDF_TYPE = 'http://www.w3.org/1999/02/22-rdf-syntax-ns#type';
const XSD = 'http://www.w3.org/2001/XMLSchema#';
const nt = (s: string, p: string, o: string): string => `<${s}> <${p}> ${o.startsWith('"') ? o : `<${o}>`} .\n`;

const SCHEMA = `@prefix ex: <${EX}> .
@prefix rdfs: <http://www.w3.org/2000/01/rdf-schema#> .
@prefix owl: <http://www.w3.org/2002/07/owl#> .
@prefix xsd: <${XSD}> .
ex:Tree a owl:Class . ex:Plot a owl:Class .
ex:Tree owl:disjointWith ex:Plot .
ex:growsIn rdfs:domain ex:Tree ; rdfs:range ex:Plot .
ex:planted rdfs:range xsd:gYear .
`;

// Twelve trees in four plots, each tree with a neighbour: enough for a tiny model to fit on.
function baseGraph(): string {
  let text = '';
  for (let p = 0; p < 4; p++) text += nt(`${EX}plot/${p}`, RDF_TYPE, `${EX}Plot`);
  for (let t = 0; t < 12; t++) {
    text += nt(`${EX}tree/${t}`, RDF_TYPE, `${EX}Tree`);
    text += nt(`${EX}tree/${t}`, `${EX}growsIn`, `${EX}plot/${t % 4}`);
    text += nt(`${EX}tree/${t}`, `${EX}nextTo`, `${EX}tree/${(t + 4) % 12}`);
    text += nt(`${EX}tree/${t}`, `${EX}planted`, `"${1990 + t}"^^<${XSD}gYear>`);
  }
  return text;
}

const BAD_OBJECT = `"last spring"^^<${XSD}gYear>`;
const CLEAN = nt(`${EX}tree/12`, RDF_TYPE, `${EX}Tree`) + nt(`${EX}tree/12`, `${EX}growsIn`, `${EX}plot/1`) + nt(`${EX}tree/12`, `${EX}nextTo`, `${EX}tree/1`);
// Line 4: a gYear that is not one (literal-lexical, severity error).
const BAD = CLEAN + nt(`${EX}tree/12`, `${EX}planted`, BAD_OBJECT);

let root: string;
/** A fresh working folder holding the graphs, so that each test's config and reports stay apart. */
function workdir(): string {
  const dir = mkdtempSync(join(root, 'case-'));
  writeFileSync(join(dir, 'schema.ttl'), SCHEMA);
  writeFileSync(join(dir, 'base.nt'), baseGraph());
  writeFileSync(join(dir, 'clean.nt'), CLEAN);
  writeFileSync(join(dir, 'bad.nt'), BAD);
  return dir;
}

const suppression = (expires?: string): Record<string, string> => ({
  subject: `<${EX}tree/12>`,
  predicate: `${EX}planted`,
  object: BAD_OBJECT,
  check: 'literal-lexical',
  reason: 'reviewed: the planting year is being traced in the nursery ledger',
  ...(expires ? { expires } : {}),
});

function readReport(dir: string, out = 'out'): AuditReport {
  const value = JSON.parse(readFileSync(join(dir, out, 'report.json'), 'utf8')) as unknown;
  expect(validateReport(value)).toEqual([]);
  return value as AuditReport;
}

const gate = (dir: string, ...args: string[]) => runCli(['gate', ...args], { cwd: dir });

beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), 'plumb-gate-cli-'));
});

describe('plumb gate: exit codes', () => {
  it('passes clean incoming triples (0) and writes its reports in --out, relative to the working folder', async () => {
    const dir = workdir();
    const run = await gate(dir, 'clean.nt', '--base', 'base.nt', '--schema', 'schema.ttl', '--no-model', '--out', 'out');
    expect(run.stderr).not.toContain('plumb: internal');
    expect(run.exitCode).toBe(0);
    expect(run.stdout).toContain('gate: passed');
    expect(run.stdout.match(/gate: passed/g)).toHaveLength(1);
    const report = readReport(dir);
    expect(report.command).toBe('gate');
    expect(report.gate).toMatchObject({ passed: true, crossed: [] });
    // Only the three incoming triples are audited; the base is context.
    expect(report.accounting.accepted).toBe(3);
    expect(report.findings).toEqual([]);
    expect(readdirSync(join(dir, 'out')).sort()).toEqual(['junit.xml', 'report.json', 'report.sarif', 'summary.md']);
  });

  it('fails incoming triples with an error (1), naming the threshold and the file:line of the finding', async () => {
    const dir = workdir();
    const run = await gate(dir, 'bad.nt', '--base', 'base.nt', '--schema', 'schema.ttl', '--no-model', '--out', 'out', '--format', 'all');
    expect(run.exitCode).toBe(1);
    expect(run.stdout).toContain('gate: FAILED');
    expect(run.stdout).toContain('1 error > --max-errors 0');
    const report = readReport(dir);
    expect(report.gate?.passed).toBe(false);
    const errors = report.findings.filter((f) => f.severity === 'error');
    expect(errors.map((f) => f.check)).toEqual(['literal-lexical']);
    expect(errors[0]!.source).toEqual({ file: join(dir, 'bad.nt'), line: 4 });
    // Every format was written and no partial file was left behind (atomic writes: see the note at the top).
    expect(readdirSync(join(dir, 'out')).sort()).toEqual(['junit.xml', 'report.html', 'report.json', 'report.sarif', 'summary.md']);
  });

  it('passes when a --max-errors allows the error (0)', async () => {
    const dir = workdir();
    const run = await gate(dir, 'bad.nt', '--base', 'base.nt', '--schema', 'schema.ttl', '--no-model', '--max-errors', '1');
    expect(run.exitCode).toBe(0);
    expect(existsSync(join(dir, 'reports', 'gate', 'report.json'))).toBe(true);
  });

  it('passes incoming triples whose only findings are suppressed (0), keeping them in the reports', async () => {
    const dir = workdir();
    writeFileSync(join(dir, 'accepted.json'), JSON.stringify([suppression('2999-12-31')], null, 2));
    const run = await gate(dir, 'bad.nt', '--base', 'base.nt', '--schema', 'schema.ttl', '--no-model', '--suppressions', 'accepted.json', '--out', 'out');
    expect(run.exitCode).toBe(0);
    expect(run.stdout).toContain('1 accepted by the suppressions file');
    const report = readReport(dir);
    expect(report.findings.filter((f) => f.severity === 'error')).toEqual([]);
    expect(report.suppressed?.map((s) => s.finding.check)).toEqual(['literal-lexical']);
    expect(report.gate).toMatchObject({ passed: true, suppressed: 1, expiredSuppressions: 0 });
    // SARIF 2.1.0 §3.27.23: a suppressed result carries a `suppressions` array.
    const sarif = JSON.parse(readFileSync(join(dir, 'out', 'report.sarif'), 'utf8')) as { runs: Array<{ results: Array<{ suppressions?: unknown[] }> }> };
    expect(sarif.runs[0]!.results.filter((r) => (r.suppressions ?? []).length > 0)).toHaveLength(1);
  });

  it('fails on a finding whose suppression has expired (1), with a note saying so', async () => {
    const dir = workdir();
    writeFileSync(join(dir, 'accepted.json'), JSON.stringify([suppression('2001-03-31')]));
    const run = await gate(dir, 'bad.nt', '--base', 'base.nt', '--schema', 'schema.ttl', '--no-model', '--suppressions', 'accepted.json', '--out', 'out');
    expect(run.exitCode).toBe(1);
    expect(run.stdout).toContain('note: 1 suppression has expired');
    const report = readReport(dir);
    expect(report.gate).toMatchObject({ passed: false, expiredSuppressions: 1, suppressed: 0 });
    const back = report.findings.find((f) => f.check === 'literal-lexical')!;
    expect(back.message).toContain('expired on 2001-03-31');
    expect(back.evidence.suppression).toEqual({ expired: '2001-03-31', reason: suppression().reason });
  });

  it('takes the base and thresholds from plumb.config.json, a flag on the command line winning', async () => {
    const dir = workdir();
    writeFileSync(join(dir, 'plumb.config.json'), JSON.stringify({ base: 'base.nt', schema: 'schema.ttl', maxErrors: 1, out: 'from-config' }));
    const relaxed = await gate(dir, 'bad.nt', '--no-model');
    expect(relaxed.exitCode).toBe(0);
    expect(existsSync(join(dir, 'from-config', 'report.json'))).toBe(true);
    const strict = await gate(dir, 'bad.nt', '--no-model', '--max-errors', '0');
    expect(strict.exitCode).toBe(1);
  });

  it('refuses a plumb.config.json with an unknown key (2), naming the file, the line and the key', async () => {
    const dir = workdir();
    writeFileSync(join(dir, 'plumb.config.json'), '{\n  "base": "base.nt",\n  "maxErorrs": 0\n}\n');
    const run = await gate(dir, 'clean.nt', '--no-model');
    expect(run.exitCode).toBe(2);
    expect(run.stderr).toContain(`${join(dir, 'plumb.config.json')}:3`);
    expect(run.stderr).toContain('unknown key "maxErorrs"');
    expect(run.stderr).toContain('did you mean "maxErrors"');
    expect(run.stderr).not.toMatch(/\n\s+at /);
    expect(existsSync(join(dir, 'reports'))).toBe(false);
  });

  it('refuses a plumb.config.json with a bad value or bad JSON (2), naming the key or the position', async () => {
    const dir = workdir();
    writeFileSync(join(dir, 'plumb.config.json'), '{ "base": "base.nt", "minPlausibility": 2 }');
    const value = await gate(dir, 'clean.nt', '--no-model');
    expect(value.exitCode).toBe(2);
    expect(value.stderr).toContain('"minPlausibility" must be a number ≥ 0 and ≤ 1');
    writeFileSync(join(dir, 'plumb.config.json'), '{\n  "base": "base.nt",\n}\n');
    const syntax = await gate(dir, 'clean.nt', '--no-model');
    expect(syntax.exitCode).toBe(2);
    expect(syntax.stderr).toContain(`${join(dir, 'plumb.config.json')}:3:1`);
    expect(syntax.stderr).toContain('is not valid JSON');
  });

  it('needs --base (2)', async () => {
    const dir = workdir();
    const run = await gate(dir, 'clean.nt', '--no-model');
    expect(run.exitCode).toBe(2);
    expect(run.stderr).toContain('the gate needs the base graph');
    expect(run.stderr).toContain('--base');
  });

  it('exits 2 on a file it cannot read, naming it', async () => {
    const dir = workdir();
    const incoming = await gate(dir, 'missing.nt', '--base', 'base.nt', '--no-model');
    expect(incoming.exitCode).toBe(2);
    expect(incoming.stderr).toContain('missing.nt');
    expect(incoming.stderr).not.toContain('internal error');
    const base = await gate(dir, 'clean.nt', '--base', 'no-base.nt', '--no-model');
    expect(base.exitCode).toBe(2);
    expect(base.stderr).toContain('no-base.nt');
    mkdirSync(join(dir, 'a-folder.nt'));
    const folder = await gate(dir, 'a-folder.nt', '--base', 'base.nt', '--no-model');
    expect(folder.exitCode).toBe(2);
    const suppressions = await gate(dir, 'clean.nt', '--base', 'base.nt', '--no-model', '--suppressions', 'nowhere.json');
    expect(suppressions.exitCode).toBe(2);
    expect(suppressions.stderr).toContain('nowhere.json');
  });

  it('exits 2 on a bad threshold', async () => {
    const dir = workdir();
    const run = await gate(dir, 'clean.nt', '--base', 'base.nt', '--no-model', '--max-errors', 'none');
    expect(run.exitCode).toBe(2);
    expect(run.stderr).toContain('--max-errors');
  });
});

describe('plumb gate with a saved model', () => {
  it('scores the incoming triples with the model, without refitting, and passes clean ones', async () => {
    const dir = workdir();
    const { graph } = await readGraph([join(dir, 'base.nt')]);
    const model = await fit(graph, { dim: 8, epochs: 3, batchSize: 64, negatives: 2, seed: 3, backend: 'cpu' });
    await model.save(join(dir, 'model'));
    model.dispose();
    const run = await gate(dir, 'clean.nt', '--base', 'base.nt', '--schema', 'schema.ttl', '--model', 'model', '--out', 'out');
    expect(run.stderr).not.toContain('internal error');
    expect(run.exitCode).toBe(0);
    const report = readReport(dir);
    expect(report.options.modelDir).toBe(join(dir, 'model'));
    // The two resource-to-resource incoming triples (growsIn, nextTo) and the rdf:type one, if modelled, are scored.
    expect(report.summary.scored).toBeGreaterThanOrEqual(2);
    expect(report.durations.fit).toBeLessThan(30);
  });

  it('refuses a model that does not fit the graph (2)', async () => {
    const dir = workdir();
    writeFileSync(join(dir, 'model-base.nt'), nt(`${EX}x`, `${EX}other`, `${EX}y`) + nt(`${EX}y`, `${EX}other`, `${EX}z`));
    const { graph } = await readGraph([join(dir, 'model-base.nt')]);
    const model = await fit(graph, { dim: 4, epochs: 1, batchSize: 8, negatives: 1, seed: 3, backend: 'cpu' });
    await model.save(join(dir, 'model'));
    model.dispose();
    const run = await gate(dir, 'clean.nt', '--base', 'base.nt', '--model', 'model');
    expect(run.exitCode).toBe(2);
    expect(run.stderr).toMatch(/^plumb: .*model/);
    expect(run.stderr).not.toContain('internal error');
  });
});

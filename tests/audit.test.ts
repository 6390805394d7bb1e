import { describe, expect, it } from 'vitest';
import { auditGraphDetailed, rankFindings, type AuditSteps } from '../src/audit.js';
import type { Finding } from '../src/findings.js';
import { graphFromKeys } from '../src/graph/store.js';
import { literalKey } from '../src/graph/terms.js';
import { fakeFit } from './scoring/fake-model.js';
import { filteredRanks } from '../src/scoring/ranking.js';

const ex = (x: string): string => `http://example.org/${x}`;
const rows: Array<[string, string, string]> = [];
for (let i = 0; i < 60; i++) rows.push([ex(`e${i}`), ex(`p${i % 3}`), ex(`e${(i * 7 + 3) % 60}`)]);
rows.push([ex('e1'), ex('label'), literalKey('one')]);
const graph = graphFromKeys(rows, 'data.nt');

function steps(violationOn?: number): AuditSteps & { fake: ReturnType<typeof fakeFit> } {
  const fake = fakeFit();
  return {
    fake,
    fit: fake.fit,
    rank: (m, g, t) => filteredRanks(m, g, t),
    checks: async (g) => {
      const findings: Finding[] = [];
      if (violationOn !== undefined) {
        findings.push({
          kind: 'violation',
          check: 'range',
          severity: 'error',
          subject: g.terms.key(g.s[violationOn]!),
          predicate: g.terms.key(g.p[violationOn]!),
          object: g.terms.key(g.o[violationOn]!),
          message: 'object is not of the declared range',
          evidence: {},
          triple: violationOn,
        });
      }
      return { findings, checks: [{ id: 'range', title: 'rdfs:range', severity: 'error' }] };
    },
  };
}

describe('auditGraphDetailed', () => {
  it('scores every scorable triple, lists suspects below the threshold, explained, and ranks violations first', async () => {
    const s = steps(5);
    const run = await auditGraphDetailed(graph, { folds: 3, threshold: 0.2, top: 5, calibrate: false }, s);
    const { report, scores } = run;
    expect(scores!.triples).toHaveLength(60);
    expect(report.summary.scored).toBe(60);
    expect(report.folds).toBe(3);
    expect(report.backend).toBe('cpu');
    const suspects = report.findings.filter((f) => f.kind === 'suspect');
    expect(suspects).toHaveLength(5);
    suspects.forEach((f, i) => {
      expect(f.rank).toBe(i + 1);
      expect(f.plausibility).toBeLessThan(0.2);
      expect(f.check).toBe('model');
      expect(f.source).toEqual({ file: 'data.nt', line: f.triple! + 1 });
      expect(f.evidence.preferredObjects).toHaveLength(3);
      if (i > 0) expect(f.plausibility!).toBeGreaterThanOrEqual(suspects[i - 1]!.plausibility!);
    });
    // The lowest plausibilities in the full table are the suspects'.
    const sorted = Array.from(scores!.plausibility).sort((a, b) => a - b);
    expect(suspects.map((f) => f.plausibility)).toEqual(sorted.slice(0, 5).map((x) => Number(x.toFixed(4))));
    // The error-severity violation comes first and carries the triple's plausibility.
    expect(report.findings[0]!.kind).toBe('violation');
    expect(report.findings[0]!.plausibility).toBeTypeOf('number');
    expect(report.summary.byKind).toEqual({ syntax: 0, violation: 1, suspect: 5 });
    expect(report.checks!.map((c) => c.id)).toEqual(['range', 'model']);
    expect(report.plausibilityHistogram!.reduce((a, b) => a + b, 0)).toBe(60);
    expect(report.predicates.map((p) => p.triples).reduce((a, b) => a + b, 0)).toBe(graph.size);
    expect(report.durations.fit).toBeTypeOf('number');
    // Small graph: ranking is affordable, so plausibility combines logits and filtered ranks.
    expect(report.options.basis).toBe('combined');
    // Every fold model is disposed once explanations are done.
    expect(s.fake.live()).toBe(0);
  });

  it('reports only on the `only` triples, placing them among a scored sample of the rest', async () => {
    const only = Uint8Array.from({ length: graph.size }, (_, i) => (i < 20 ? 1 : 0));
    const s = steps(40);
    const { report, scores } = await auditGraphDetailed(graph, { folds: 2, threshold: 1, top: 100, calibrate: false, only, basis: 'logit' }, s);
    expect(Array.from(scores!.triples)).toEqual(Array.from({ length: 20 }, (_, i) => i));
    for (const f of report.findings) expect(f.triple).toBeLessThan(20);
    expect(report.predicates.map((p) => p.triples).reduce((a, b) => a + b, 0)).toBe(20);
    // The stand-in's out-of-fold logit does not depend on the fold, and this small graph's whole context
    // fits in the reference sample: each reported triple's plausibility is then the one a full audit gives it.
    const full = await auditGraphDetailed(graph, { folds: 3, threshold: 1, calibrate: false, basis: 'logit' }, steps());
    for (let j = 0; j < 20; j++) expect(scores!.plausibility[j]).toBeCloseTo(full.scores!.plausibility[j]!, 10);
    // A lone reported triple is not "the worst of its predicate" by default.
    const one = Uint8Array.from({ length: graph.size }, (_, i) => (i === 7 ? 1 : 0));
    const single = await auditGraphDetailed(graph, { folds: 2, calibrate: false, only: one, basis: 'logit' }, steps());
    expect(single.scores!.plausibility[0]).toBeCloseTo(full.scores!.plausibility[7]!, 10);
  });

  it('uses a given model without fitting', async () => {
    const s = steps();
    const model = await s.fake.fit(graph);
    s.fake.calls.length = 0;
    const { report } = await auditGraphDetailed(graph, { trainedModel: model, threshold: 0.1, calibrate: false }, s);
    expect(s.fake.calls).toHaveLength(0);
    expect(report.folds).toBe(0);
    expect(report.options.model).toBe('given');
    expect(report.findings.filter((f) => f.kind === 'suspect').length).toBeGreaterThan(0);
  });

  it('measures a trust figure on a corrupted copy without letting planted triples into the findings', async () => {
    const s = steps();
    const { report } = await auditGraphDetailed(graph, { folds: 2, threshold: 0.5, top: 1000, calibrate: true }, s);
    const trust = report.summary.trust!;
    expect(trust.injected).toBeGreaterThanOrEqual(3);
    expect(Object.keys(trust.byKind).sort()).toEqual(['predicate', 'random', 'range']);
    expect(trust.averagePrecision).toBeGreaterThanOrEqual(0);
    expect(trust.averagePrecision).toBeLessThanOrEqual(1);
    expect(trust.verdict).toMatch(/planted/);
    for (const f of report.findings) {
      expect(f.triple).toBeLessThan(graph.size);
      expect(f.source?.file).toBe('data.nt');
    }
  });
});

describe('rankFindings', () => {
  it('orders by severity, then plausibility (unscored last), then check and triple', () => {
    const f = (severity: Finding['severity'], plausibility: number | undefined, check: string, triple: number): Finding => ({
      kind: 'violation', check, severity, subject: '', predicate: '', object: '', message: '', evidence: {}, triple,
      ...(plausibility === undefined ? {} : { plausibility }),
    });
    const ranked = rankFindings([f('note', 0.1, 'a', 1), f('warning', undefined, 'a', 2), f('warning', 0.3, 'b', 3), f('error', 0.9, 'c', 4), f('warning', 0.3, 'a', 5)]);
    expect(ranked.map((x) => x.triple)).toEqual([4, 5, 3, 2, 1]);
  });
});

describe('plumb corrupt → plumb audit → plumb evaluate (CLI)', () => {
  it('writes a corrupted copy and truth file, audits it, and measures the audit against the truth', async () => {
    const { runCli } = await import('./helpers/cli.js');
    const { mkdtemp, readFile, rm } = await import('node:fs/promises');
    const { tmpdir } = await import('node:os');
    const { join, resolve } = await import('node:path');
    const dir = await mkdtemp(join(tmpdir(), 'plumb-audit-cli-'));
    try {
      // Source: Nations (Kemp et al. 2006), train split as distributed since Dettmers et al. 2018.
      const nations = resolve(import.meta.dirname, '../../shared/datasets/nations/train.txt');
      const corrupt = await runCli(['corrupt', nations, '--rate', '0.05', '--kind', 'random,range', '--out', 'nations.tsv', '--truth', 'truth.tsv', '--seed', '3'], { cwd: dir });
      expect(corrupt.stderr).toMatch(/added 80 errors \(40 random, 40 range\) to 1592 triples/);
      expect(corrupt.exitCode).toBe(0);
      const truth = (await readFile(join(dir, 'truth.tsv'), 'utf8')).trim().split('\n');
      expect(truth[0]).toBe('subject\tpredicate\tobject\tgraph\tkind\treplaced\toriginal');
      expect(truth).toHaveLength(81);
      // TSV in, TSV out: bare names as in the dataset.
      const copy = (await readFile(join(dir, 'nations.tsv'), 'utf8')).trim().split('\n');
      expect(copy).toHaveLength(1672);
      expect(copy[0]).toMatch(/^[a-z]+\t[a-z0-9]+\t[a-z]+$/);

      const audit = await runCli(['audit', 'nations.tsv', '--folds', '2', '--epochs', '3', '--no-calibrate', '--top', '20', '--out', 'out', '--format', 'json,markdown', '--workers', '0'], { cwd: dir });
      expect(audit.stderr).toMatch(/wrote .*report\.json.*scores\.tsv/);
      expect(audit.exitCode).toBe(0);
      expect(audit.stdout).toMatch(/1,672 triples scored by the model/);
      const report = JSON.parse(await readFile(join(dir, 'out', 'report.json'), 'utf8'));
      expect(report.folds).toBe(2);
      expect(report.findings.filter((f: { kind: string }) => f.kind === 'suspect').length).toBeLessThanOrEqual(20);
      const scores = (await readFile(join(dir, 'out', 'scores.tsv'), 'utf8')).trim().split('\n');
      expect(scores).toHaveLength(1673);

      const evaluate = await runCli(['evaluate', '--truth', 'truth.tsv', '--report', 'out/report.json', '--json'], { cwd: dir });
      expect(evaluate.exitCode).toBe(0);
      const metrics = JSON.parse(evaluate.stdout);
      expect(metrics.errors).toBe(80);
      expect(metrics.total).toBe(1672);
      expect(metrics.unranked).toBe(0);
      expect(Object.keys(metrics.byKind)).toEqual(['random', 'range']);
      for (const key of ['ap', 'rocAuc', 'precisionAtK', 'recallAt1pct']) expect(metrics[key]).toBeTypeOf('number');

      const text = await runCli(['evaluate', '--truth', 'truth.tsv', '--report', 'out/report.json'], { cwd: dir });
      expect(text.stdout).toMatch(/^\s+errors\s+AP\s+ROC-AUC\s+P@K\s+R@1%/);
      const missing = await runCli(['evaluate', '--truth', 'truth.tsv', '--report', 'nowhere/report.json'], { cwd: dir });
      expect(missing.exitCode).toBe(2);
      expect(missing.stderr).toMatch(/cannot read the report/);
      const both = await runCli(['evaluate', '--truth', 'truth.tsv'], { cwd: dir });
      expect(both.exitCode).toBe(2);
      expect(both.stderr).toMatch(/either --report/);

      const baselines = await runCli(['evaluate', '--truth', 'truth.tsv', '--baselines', 'nations.tsv', '--methods', 'random,degree', '--json'], { cwd: dir });
      expect(baselines.exitCode).toBe(0);
      const compared = JSON.parse(baselines.stdout);
      expect(compared.missing).toBe(0);
      expect(compared.methods.map((m: { method: string }) => m.method)).toEqual(['random', 'degree']);
      for (const m of compared.methods) expect(m).toMatchObject({ errors: 80, total: 1672 });
      const unrelated = await runCli(['evaluate', '--truth', 'truth.tsv', '--baselines', nations], { cwd: dir });
      expect(unrelated.exitCode).toBe(2);
      expect(unrelated.stderr).toMatch(/none of the 80 truth triples is in the graph/);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  }, 300_000);

  it('refuses bad corrupt options with a hint', async () => {
    const { runCli } = await import('./helpers/cli.js');
    const bad = await runCli(['corrupt', 'x.nt', '--rate', '2', '--out', 'o.nt', '--truth', 't.tsv']);
    expect(bad.exitCode).toBe(2);
    expect(bad.stderr).toMatch(/--rate 2 is out of range/);
    const kind = await runCli(['corrupt', 'x.nt', '--rate', '0.1', '--kind', 'typo', '--out', 'o.nt', '--truth', 't.tsv']);
    expect(kind.stderr).toMatch(/unknown error kind "typo"/);
  });
});

describe('shortName', () => {
  it('keeps the local part of IRIs and URNs, and literals and blank nodes whole', async () => {
    const { shortName } = await import('../src/audit.js');
    expect(shortName('http://example.org/ns#stocks')).toBe('stocks');
    expect(shortName('http://example.org/w/finch')).toBe('finch');
    expect(shortName('urn:plumb:ngoorgs3')).toBe('ngoorgs3');
    expect(shortName('"a/b"')).toBe('"a/b"');
    expect(shortName('_:b0')).toBe('_:b0');
    expect(shortName('http://example.org/')).toBe('http://example.org/');
  });
});

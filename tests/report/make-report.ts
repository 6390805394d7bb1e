import type { Finding, FindingKind, Severity } from '../../src/findings.js';
import type { AuditReport } from '../../src/result.js';

/**
 * Synthetic audit reports for the writer tests, the browser tests and the benchmark. The terms are
 * invented (`http://example.org/…`, an invented orchard-cooperative scenario), never real data.
 */

const EX = 'http://example.org/orchard/';

/** A small deterministic generator (mulberry32), so that a seed gives the same report everywhere. */
export function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export function finding(partial: Partial<Finding> = {}): Finding {
  return {
    kind: 'violation',
    check: 'range',
    severity: 'error',
    subject: `${EX}tree/1`,
    predicate: `${EX}plantedIn`,
    object: `${EX}plot/7`,
    message: 'The object of plantedIn should be a Plot.',
    source: { file: 'orchard.ttl', line: 12, column: 3 },
    evidence: { expectedType: `${EX}Plot` },
    ...partial,
  };
}

/** Builds a report around `findings`, with the summary counts computed from them. */
export function makeReport(findings: Finding[], overrides: Partial<AuditReport> = {}): AuditReport {
  const byKind: Record<FindingKind, number> = { syntax: 0, violation: 0, suspect: 0 };
  const bySeverity: Record<Severity, number> = { error: 0, warning: 0, note: 0 };
  const predicates = new Map<string, { triples: number; violations: number; suspects: number }>();
  for (const f of findings) {
    byKind[f.kind] += 1;
    bySeverity[f.severity] += 1;
    if (f.predicate === '') continue;
    const row = predicates.get(f.predicate) ?? { triples: 0, violations: 0, suspects: 0 };
    row.triples += 3;
    if (f.kind === 'violation') row.violations += 1;
    if (f.kind === 'suspect') row.suspects += 1;
    predicates.set(f.predicate, row);
  }
  const scored = findings.filter((f) => f.plausibility !== undefined).length;
  const histogram = new Array<number>(20).fill(0);
  for (const f of findings) if (f.plausibility !== undefined) histogram[Math.min(19, Math.floor(f.plausibility * 20))]! += 1;
  return {
    format: 'plumb-report',
    formatVersion: 1,
    tool: { name: 'plumb', version: '0.1.0' },
    command: 'audit',
    createdAt: '2024-05-01T10:00:00.000Z',
    inputs: [
      { path: 'data/orchard.ttl', format: 'turtle', bytes: 123_456, sha256: 'a'.repeat(64), statements: 4_000 },
      { path: 'data/harvest log.nt', format: 'n-triples', bytes: 7_890, sha256: '0123456789abcdef'.repeat(4), statements: 300 },
    ],
    accounting: { read: 4_300, accepted: 4_200, duplicates: 80, rejected: 20 },
    options: { folds: 5, seed: 7, format: ['json', 'html'], closedWorld: false },
    seed: 7,
    backend: 'wasm',
    folds: 5,
    durations: { read: 0.25, checks: 0.5, fit: 12.5, score: 3.25, report: 0.1 },
    summary: {
      findings: findings.length,
      byKind,
      bySeverity,
      scored: Math.max(scored, 4_200),
      trust: {
        injected: 210,
        averagePrecision: 0.41,
        precisionAtK: 0.38,
        baseline: 0.05,
        byKind: { random: { injected: 105, averagePrecision: 0.52, precisionAtK: 0.47 }, range: { injected: 105, averagePrecision: 0.3, precisionAtK: 0.29 } },
        verdict: 'The ranking finds planted errors about eight times as often as chance on this graph.',
      },
    },
    predicates: [...predicates.entries()].map(([predicate, r]) => ({ predicate, ...r })),
    plausibilityHistogram: histogram,
    findings,
    checks: [
      { id: 'domain', title: 'The subject has the type the predicate’s rdfs:domain declares', severity: 'error' },
      { id: 'range', title: 'The object has the type the predicate’s rdfs:range declares', severity: 'error' },
      { id: 'model', title: 'The relational model finds the triple implausible', severity: 'warning' },
    ],
    ...overrides,
  };
}

const CHECKS = ['domain', 'range', 'mined-functional', 'datatype', 'shacl'];
const PREDICATES = ['plantedIn', 'pickedBy', 'variety', 'yieldKg', 'inspectedOn', 'neighbourOf', 'graftedFrom'].map((p) => EX + p);

/** `n` findings in ranked order: a tenth violations, the rest model suspects with falling plausibility. */
export function manyFindings(n: number, seed = 1): Finding[] {
  const random = rng(seed);
  const out: Finding[] = [];
  for (let i = 0; i < n; i++) {
    const violation = i % 10 === 0;
    const predicate = PREDICATES[Math.floor(random() * PREDICATES.length)]!;
    const subject = `${EX}tree/${Math.floor(random() * 50_000)}`;
    const object = random() < 0.3 ? `"${Math.floor(random() * 900)}"^^<http://www.w3.org/2001/XMLSchema#integer>` : `${EX}plot/${Math.floor(random() * 3_000)}`;
    if (violation) {
      out.push({
        kind: 'violation',
        check: CHECKS[i % CHECKS.length]!,
        severity: i % 20 === 0 ? 'error' : 'warning',
        subject,
        predicate,
        object,
        message: `Finding ${i + 1}: the object breaks the constraint on ${predicate.slice(EX.length)}.`,
        source: { file: `data/part-${i % 4}.ttl`, line: 1 + ((i * 7) % 90_000) },
        evidence: { constraint: 'rdfs:range', expected: `${EX}Plot`, support: 120, confidence: 0.97 },
      });
    } else {
      const plausibility = Math.round((i / n) * 0.5 * 1e4) / 1e4;
      out.push({
        kind: 'suspect',
        check: 'model',
        severity: plausibility < 0.05 ? 'warning' : 'note',
        subject,
        predicate,
        object,
        message: `Finding ${i + 1}: the model ranks this object low among the candidates.`,
        source: { file: `data/part-${i % 4}.ttl`, line: 1 + ((i * 13) % 90_000), column: 1 },
        plausibility,
        rank: i + 1,
        evidence: {
          alternatives: [
            { object: `${EX}plot/${(i * 3) % 3_000}`, plausibility: 0.91 },
            { object: `${EX}plot/${(i * 5) % 3_000}`, plausibility: 0.87 },
          ],
          subjectRank: 17,
          objectRank: 412,
        },
      });
    }
  }
  return out;
}

import { mkdir, rm } from 'node:fs/promises';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { auditDetailed, scoresText, SCORES_FILE, type AuditRun } from './audit.js';
import { PlumbError } from './errors.js';
import type { Finding } from './findings.js';
import { averagePrecision, precisionAt, recallAtShare } from './evaluation/detection.js';
import { gateDetailed, type GateRunDetailed } from './gate-run.js';
import { fit } from './model/index.js';
import type { ModelConfig } from './model/types.js';
import type { ProgressSink } from './progress.js';
import { REPORT_FORMATS, writeFileAtomic, writeReports } from './report/index.js';
import type { AuditReport } from './result.js';
import { DEFAULT_SEED, writeDemo, type DemoFiles, type PlantedError, type PlantedKind } from '../fixtures/demo/generate.js';

/**
 * `plumb demo` as a function: build the invented ferry-network scenario, audit its base graph, fit
 * and save a model on the base, gate the incoming file against the base with that saved model, write
 * every report format, and measure the gate against the scenario's truth file.
 */

/**
 * Model settings of the demo, chosen by measurement so that the whole demo stays within about three
 * minutes on a 2-core machine at scale 1 (figures in the report of the issue and in
 * tests/e2e/demo.test.ts); the global defaults stay as they are.
 *
 * The audit's fold models keep uniform negative sampling and early stopping on validation MRR, as an
 * ordinary audit does. The saved model the gate uses draws its negatives from entities seen in the
 * same position of the same predicate (`typed`): the gate's hard errors are type-correct (a vessel
 * registered at a port, but the wrong one), and a model trained against type-correct negatives ranks
 * them far better (measured on the scale-1 scenario: average precision 0.47–0.56 against 0.10–0.14 with uniform
 * negatives and more epochs). Its validation MRR ranks against all entities, which typed training
 * does not learn to do, so the saved model trains for a fixed number of epochs without validation.
 */
export const DEMO_AUDIT_MODEL: Readonly<Partial<ModelConfig>> = Object.freeze({ dim: 32, epochs: 20, patience: 20, learningRate: 0.02 });
export const DEMO_SAVED_MODEL: Readonly<Partial<ModelConfig>> = Object.freeze({ dim: 48, epochs: 25, learningRate: 0.05, sampling: 'typed' });
/**
 * Training steps per epoch, which set the batch size from the graph's size: every R-GCN step encodes
 * the whole graph, so the number of steps sets the time, and a fixed batch would leave a small
 * scenario with one or two steps per epoch (measured at scale 0.25: trust figure 0.06 with one step
 * per epoch against 0.39 with eight).
 */
const STEPS_PER_EPOCH = { audit: 6, saved: 5 };
/** `--fast`: fewer epochs for both. */
export const DEMO_FAST: { audit: Readonly<Partial<ModelConfig>>; saved: Readonly<Partial<ModelConfig>> } = Object.freeze({
  audit: Object.freeze({ ...DEMO_AUDIT_MODEL, epochs: 8 }),
  saved: Object.freeze({ ...DEMO_SAVED_MODEL, epochs: 12 }),
});

export interface DemoRunOptions {
  /** Folder for everything the demo writes (default `reports/demo`). */
  out?: string;
  /** 1 = the full scenario (about 30k base triples); 0.2–0.3 for tests. */
  scale?: number;
  /** Seed of the scenario and of the model. */
  seed?: number;
  /** Fewer epochs and no trust figure: about half the time, a rougher ranking. */
  fast?: boolean;
  /** Overrides of the audit's fold-model settings ({@link DEMO_AUDIT_MODEL}). */
  auditModel?: Partial<ModelConfig>;
  /** Overrides of the saved model's settings ({@link DEMO_SAVED_MODEL}). */
  savedModel?: Partial<ModelConfig>;
  /** Out-of-fold folds of the base audit (default 2). */
  folds?: number;
  /** Plant errors in a copy of the base graph for the trust figure (default true; false with `fast`). */
  calibrate?: boolean;
  /**
   * Wall-clock seconds for the audit's model fits, trust figure included (default 70), and for the
   * saved model's fit (default 75): on a busy machine the models stop early instead of the demo
   * running long. Tests that need the same result on every run pass large budgets.
   */
  auditSeconds?: number;
  fitSeconds?: number;
  progress?: ProgressSink;
}

/** How the gate did against the truth file. */
export interface DemoEvaluation {
  /** Planted errors by kind. */
  planted: Record<PlantedKind, number>;
  /** Planted schema errors (every kind but `plausible`) found by the check the truth file expects. */
  schema: { planted: number; found: number; byKind: Partial<Record<PlantedKind, { planted: number; found: number }>>; missed: PlantedError[] };
  /**
   * The type-correct (`plausible`) errors in the model's ranking of the incoming triples, ranked
   * against the correct incoming triples only (the planted schema errors left out, as the checks'
   * job): precision among the K least plausible (K = plausible errors scored), recall within the
   * least plausible 5%, average precision, and the share a random order would reach.
   */
  plausible: { planted: number; scored: number; ranked: number; precisionAtK: number; recallTop5pct: number; averagePrecision: number; baseline: number; listed: number };
}

export interface DemoResult {
  out: string;
  dataDir: string;
  files: DemoFiles;
  modelDir: string;
  audit: { dir: string; written: string[]; report: AuditReport };
  gate: { dir: string; written: string[]; report: AuditReport; exitCode: 0 | 1 };
  truth: PlantedError[];
  evaluation: DemoEvaluation;
  /** Seconds per part: data, audit, fit, gate, reports, total. */
  seconds: Record<string, number>;
  /** The options in force after defaults. */
  settings: {
    scale: number;
    seed: number;
    fast: boolean;
    folds: number;
    calibrate: boolean;
    auditModel: Partial<ModelConfig>;
    savedModel: Partial<ModelConfig>;
    auditSeconds: number;
    fitSeconds: number;
  };
}

const round = (x: number, digits = 3): number => (Number.isFinite(x) ? Number(x.toFixed(digits)) : x);

function tripleKey(s: string, p: string, o: string): string {
  return `${s}\u0000${p}\u0000${o}`;
}

/** Compares the gate's findings and scores with the truth file. */
export function evaluateDemo(gate: Pick<GateRunDetailed, 'report' | 'scores' | 'graph'>, truth: readonly PlantedError[], incomingFrom: number): DemoEvaluation {
  const planted = { domain: 0, range: 0, cardinality: 0, disjoint: 0, literal: 0, shape: 0, plausible: 0 } as Record<PlantedKind, number>;
  for (const e of truth) planted[e.kind]++;

  // A suppressed finding was still found: the gate's list and the suppressed ones together.
  const all: Finding[] = [...gate.report.findings, ...(gate.report.suppressed ?? []).map((s) => s.finding)];
  const { graph, scores } = gate;
  const keyOfTriple = (t: number): string => tripleKey(graph.terms.key(graph.s[t]!), graph.terms.key(graph.p[t]!), graph.terms.key(graph.o[t]!));
  const checksOf = new Map<string, Set<string>>();
  for (const f of all) {
    // Entity-level findings (a functional property with two values) name the entity, not the whole
    // triple; the triple they point at is the one that broke the rule.
    const key = f.triple !== undefined && f.triple < graph.size ? keyOfTriple(f.triple) : tripleKey(f.subject, f.predicate, f.object);
    let set = checksOf.get(key);
    if (!set) checksOf.set(key, (set = new Set()));
    set.add(f.check);
  }
  const schema: DemoEvaluation['schema'] = { planted: 0, found: 0, byKind: {}, missed: [] };
  for (const e of truth) {
    if (e.kind === 'plausible') continue;
    const row = (schema.byKind[e.kind] ??= { planted: 0, found: 0 });
    schema.planted++;
    row.planted++;
    const checks = checksOf.get(tripleKey(e.subject, e.predicate, e.object));
    if (e.expectedCheck !== undefined && checks?.has(e.expectedCheck)) {
      schema.found++;
      row.found++;
    } else {
      schema.missed.push(e);
    }
  }

  const kindOf = new Map<string, PlantedKind>();
  for (const e of truth) kindOf.set(tripleKey(e.subject, e.predicate, e.object), e.kind);
  const suspicion: number[] = [];
  const labels: number[] = [];
  let scored = 0;
  if (scores) {
    scores.triples.forEach((t, j) => {
      if (graph.provenance.file[t]! < incomingFrom) return;
      const p = scores.plausibility[j]!;
      if (Number.isNaN(p)) return;
      const kind = kindOf.get(keyOfTriple(t));
      if (kind !== undefined && kind !== 'plausible') return;
      if (kind === 'plausible') scored++;
      suspicion.push(1 - p);
      labels.push(kind === 'plausible' ? 1 : 0);
    });
  }
  const listed = gate.report.findings.filter((f) => f.kind === 'suspect' && kindOf.get(tripleKey(f.subject, f.predicate, f.object)) === 'plausible').length;
  const plausible: DemoEvaluation['plausible'] = {
    planted: planted.plausible,
    scored,
    ranked: suspicion.length,
    precisionAtK: scored === 0 ? 0 : round(precisionAt(suspicion, labels, scored)),
    recallTop5pct: scored === 0 ? 0 : round(recallAtShare(suspicion, labels, 0.05)),
    averagePrecision: scored === 0 ? 0 : round(averagePrecision(suspicion, labels)),
    baseline: suspicion.length === 0 ? 0 : round(scored / suspicion.length),
    listed,
  };
  return { planted, schema, plausible };
}

/** Lines of N-Triples text whose object is a resource: the triples a model trains on. */
function resourceObjects(ntriples: string): number {
  let n = 0;
  for (const line of ntriples.split('\n')) {
    const o = line.split(' ', 3)[2];
    if (o !== undefined && (o.startsWith('<') || o.startsWith('_:'))) n++;
  }
  return n;
}

/** Runs the demo end to end; see {@link DemoRunOptions}. Prints nothing. */
export async function runDemo(options: DemoRunOptions = {}): Promise<DemoResult> {
  const started = performance.now();
  const out = options.out ?? join('reports', 'demo');
  const fast = options.fast ?? false;
  const scale = options.scale ?? 1;
  const seed = options.seed ?? DEFAULT_SEED;
  const folds = options.folds ?? 2;
  const calibrate = options.calibrate ?? !fast;
  const modelSeed = seed % 2 ** 31;
  const auditSeconds = options.auditSeconds ?? (fast ? 30 : 60);
  // One fold per core side by side, each in a worker thread with its own TensorFlow.js.
  const workers = Math.min(folds, availableParallelism());
  const fitSeconds = options.fitSeconds ?? (fast ? 30 : 60);
  const progress = options.progress ?? (() => {});
  const seconds: Record<string, number> = {};
  const timed = async <T>(part: string, work: () => Promise<T>): Promise<T> => {
    const t0 = performance.now();
    progress({ phase: `demo: ${part}`, done: 0 });
    try {
      return await work();
    } finally {
      seconds[part] = round((performance.now() - t0) / 1000, 2);
    }
  };

  const dataDir = join(out, 'data');
  const modelDir = join(out, 'model');
  const auditDir = join(out, 'audit');
  const gateDir = join(out, 'gate');
  const { files, scenario } = await timed('data', () => writeDemo(dataDir, { seed, scale }));

  const modelTriples = resourceObjects(scenario.base);
  const batch = (triples: number, steps: number): number => Math.max(128, Math.ceil(triples / steps));
  const auditModel: Partial<ModelConfig> = {
    ...(fast ? DEMO_FAST.audit : DEMO_AUDIT_MODEL),
    batchSize: batch(modelTriples * (1 - 1 / folds), STEPS_PER_EPOCH.audit),
    seed: modelSeed,
    ...options.auditModel,
  };
  const savedModel: Partial<ModelConfig> = {
    ...(fast ? DEMO_FAST.saved : DEMO_SAVED_MODEL),
    batchSize: batch(modelTriples, STEPS_PER_EPOCH.saved),
    seed: modelSeed,
    ...options.savedModel,
  };

  const auditRun: AuditRun = await timed('audit', () =>
    auditDetailed([files.base], {
      schema: [files.ontology],
      shapes: [files.shapes],
      folds,
      seed,
      calibrate,
      model: auditModel,
      workers,
      // crossFit gives each fold model maxSeconds / folds; folds run `workers` at a time, and the
      // trust figure fits its fold models again, on the copy, under the same budget.
      maxSeconds: ((calibrate ? auditSeconds / 2 : auditSeconds) * folds) / Math.ceil(folds / Math.max(1, workers)),
      progress,
    }),
  );

  await timed('fit', async () => {
    // No validation triples: typed training does not learn what validation MRR measures (see DEMO_SAVED_MODEL).
    const trained = await fit(auditRun.graph, { ...savedModel, valid: new Int32Array(0), maxSeconds: fitSeconds, progress });
    try {
      await rm(modelDir, { recursive: true, force: true });
      await mkdir(out, { recursive: true });
      await trained.save(modelDir);
    } catch (cause) {
      if (cause instanceof PlumbError) throw cause;
      throw new PlumbError('E_INPUT', `cannot save the demo model to ${modelDir}: ${(cause as Error).message}`, { hint: 'choose a folder you can write to with --out', cause });
    } finally {
      trained.dispose();
    }
  });

  const gateRun = await timed('gate', () =>
    gateDetailed([files.incoming], {
      base: [files.base],
      schema: [files.ontology],
      shapes: [files.shapes],
      modelDir,
      seed,
      progress,
    }),
  );

  const written = await timed('reports', async () => {
    const auditWritten = await writeReports(auditRun.report, auditDir, REPORT_FORMATS);
    if (auditRun.scores) {
      const path = join(auditDir, SCORES_FILE);
      await writeFileAtomic(path, scoresText(auditRun));
      auditWritten.push(path);
    }
    const gateWritten = await writeReports(gateRun.report, gateDir, REPORT_FORMATS);
    return { audit: auditWritten, gate: gateWritten };
  });

  const evaluation = evaluateDemo(gateRun, scenario.truth, 1);
  seconds.total = round((performance.now() - started) / 1000, 2);
  return {
    out,
    dataDir,
    files,
    modelDir,
    audit: { dir: auditDir, written: written.audit, report: auditRun.report },
    gate: { dir: gateDir, written: written.gate, report: gateRun.report, exitCode: gateRun.exitCode },
    truth: scenario.truth,
    evaluation,
    seconds,
    settings: { scale, seed, fast, folds, calibrate, auditModel, savedModel, auditSeconds, fitSeconds },
  };
}

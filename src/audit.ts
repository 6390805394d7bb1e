import type { Finding, Severity } from './findings.js';
import { severityRank } from './findings.js';
import { row, type Graph } from './graph/store.js';
import { Random } from './model/random.js';
import type { Accounting, AuditReport, CheckInfo, InputInfo, PredicateRow, TrustFigure } from './result.js';
import type { ProgressSink } from './progress.js';
import type { BackendName, ModelConfig, TrainedModel } from './model/types.js';
import { defaultWorkers } from './scoring/fold-worker.js';
import { crossFit, entityCount, scoreTriples, scorableTriples, type CrossFitResult, type FitFunction, type RankFunction, type WarmStart } from './scoring/crossfit.js';
import { chooseBasis, histogram, plausibility, type OutOfFoldScores, type PlausibilityBasis } from './scoring/plausibility.js';
import { explainTriples, explanationLine, type Explanation } from './scoring/explain.js';
import { corruptGraph, CORRUPTION_KINDS, termToField } from './evaluation/corrupt.js';
import { detectionTable } from './evaluation/detection.js';
import { VERSION } from './version.js';
import type { ReadOptions } from './sources/index.js';
import { checkGraph, readInputs, rejectionFinding } from './checks/run.js';
import type { RunChecksOptions } from './checks/index.js';
import { fit, loadModel } from './model/index.js';
import { filteredRanks } from './scoring/ranking.js';

/**
 * The audit: read, check, fit (or load) a model, score every triple out-of-fold, and merge the
 * constraint violations and the low-plausibility triples into one ranked list of findings.
 * The steps that other parts of plumb provide (reading, checking, fitting, ranking) come in as
 * {@link AuditSteps}, so this file holds only the orchestration.
 */

/** Defaults chosen by measurement; see tests/outside/detection-*.test.ts and tests/bench/audit.ts. */
export const AUDIT_DEFAULTS = {
  /**
   * 3 folds: on corrupted UMLS and Kinship (5% random errors, 100 epochs per fold model) 5 folds gave
   * AP 0.647 / 0.782 and 3 folds 0.635 / 0.775, for 60% of the fitting time.
   */
  folds: 3,
  warmStart: 'none' as WarmStart,
  /** `combined` where ranking every triple is affordable, else `logit` (see chooseBasis). */
  basis: 'auto' as PlausibilityBasis | 'auto',
  /** A scored triple below this plausibility is a suspect. */
  threshold: 0.02,
  /** Suspects listed at most (all triples are still scored). */
  top: 200,
  /** Preferred entities listed per side in a suspect's evidence. */
  candidates: 3,
  seed: 1,
  /** Below this many model triples, `calibrate` is on unless turned off. */
  calibrateUpTo: 20_000,
  /** Share planted for the trust figure, spread over the three kinds. */
  calibrateRate: 0.03,
  /**
   * Wall-clock seconds for all fold fits together (0: no limit). Small graphs never reach it; on a
   * ~250k-triple graph it is what keeps the audit inside half an hour on a 2-core machine, and the
   * fold models then get as many epochs as fit (the result depends on the machine's speed).
   */
  timeBudget: 1500,
};

export interface AuditOptions {
  /** Run the schema and mined checks (default true). */
  checks?: boolean;
  /** Options of the checks (closed world, mined thresholds, which checks). */
  checkOptions?: RunChecksOptions;
  /** The model: settings for fitting fold models. */
  model?: Partial<ModelConfig>;
  backend?: BackendName | 'auto';
  folds?: number;
  warmStart?: WarmStart;
  basis?: PlausibilityBasis | 'auto';
  threshold?: number;
  top?: number;
  candidates?: number;
  seed?: number;
  /** Plant synthetic errors in a copy and measure the ranking on them; default: on for small graphs. */
  calibrate?: boolean;
  calibrateRate?: number;
  /** Time budget for all model fits together (seconds). */
  maxSeconds?: number;
  /** Worker threads fitting folds side by side (default: one per core, at most one per fold; 0 = none). */
  workers?: number;
  /** Skip the model (checks only). */
  noModel?: boolean;
  progress?: ProgressSink;
}

export interface AuditGraphOptions extends AuditOptions {
  /** Parsed schema and shapes graphs for the checks. */
  schemaGraphs?: readonly Graph[];
  shapesGraphs?: readonly Graph[];
  inputs?: InputInfo[];
  accounting?: Accounting;
  /** Findings from reading (syntax), merged into the list. */
  readFindings?: Finding[];
  /** Report only on these triples (1 = report); the rest is context for the model and the checks. */
  only?: Uint8Array;
  /**
   * Score with this model instead of fitting (no refit). Triples it trained on are then scored
   * in-sample: use it for triples it never saw (the gate's incoming triples).
   */
  trainedModel?: TrainedModel;
  command?: AuditReport['command'];
  /** Seconds already spent reading, for the report. */
  readSeconds?: number;
}

/** What the audit needs from the rest of plumb. */
export interface AuditSteps {
  fit: FitFunction;
  /** True when `fit` and `rank` are plumb's own, so folds may run in worker threads (which load those). */
  workers?: boolean;
  rank?: RankFunction;
  checks?: (graph: Graph, schemaGraphs: readonly Graph[], shapesGraphs: readonly Graph[], progress: ProgressSink) => Promise<{ findings: Finding[]; checks: CheckInfo[] }>;
}

/** Plausibility and logit of every scored triple: the full ranking behind the suspects. */
export interface TripleScores {
  triples: Int32Array;
  plausibility: Float64Array;
  logit: Float32Array;
  /** Fold each triple was held out in; -1 when scored by a given model. */
  fold: Int8Array;
  /**
   * 1-based position of each scored triple in the audit's whole ranking: triples with findings in
   * the order of the findings list, then the rest by rising plausibility.
   */
  order: Int32Array;
}

export interface AuditRun {
  report: AuditReport;
  scores: TripleScores | undefined;
  graph: Graph;
}

const MODEL_CHECK: CheckInfo = { id: 'model', title: 'The relational model finds the triple implausible for its predicate (out-of-fold)', severity: 'warning' };

const round = (x: number, digits = 4): number => (Number.isFinite(x) ? Number(x.toFixed(digits)) : x);

/** Local name of a term for messages: after the last `#`, `/` or `:` (URNs). */
export function shortName(key: string): string {
  if (key.startsWith('"') || key.startsWith('_:')) return key;
  const cut = Math.max(key.lastIndexOf('#'), key.lastIndexOf('/'), key.lastIndexOf(':'));
  return cut >= 0 && cut < key.length - 1 ? key.slice(cut + 1) : key;
}

/** The model part of an audit: out-of-fold (or given-model) scores and plausibility. */
async function scoreGraph(
  graph: Graph,
  options: AuditGraphOptions,
  steps: AuditSteps,
  progress: ProgressSink,
  keepModels: boolean,
): Promise<{ oof: OutOfFoldScores & { fold: Int8Array }; plaus: Float64Array; backend: BackendName; folds: number; fitSeconds: number; scoreSeconds: number; models: Map<number, TrainedModel>; release: () => Promise<void> }> {
  const basis = resolveBasis(graph, options);
  const needRanks = basis !== 'logit';
  const models = new Map<number, TrainedModel>();
  if (options.trainedModel) {
    const model = options.trainedModel;
    const started = performance.now();
    const scorable = scorableTriples(graph);
    const idx: number[] = [];
    for (let i = 0; i < graph.size; i++) if (scorable[i]) idx.push(i);
    const triples = Int32Array.from(idx);
    const logit = await scoreTriples(model, graph, triples);
    const oof: OutOfFoldScores & { fold: Int8Array } = {
      triples,
      predicate: Int32Array.from(triples, (t) => graph.p[t]!),
      logit,
      candidates: model.entities.count,
      fold: new Int8Array(triples.length).fill(-1),
    };
    if (needRanks) {
      if (!steps.rank) throw new Error('rank-based plausibility needs the ranking step');
      const r = await steps.rank(model, graph, triples);
      oof.subjectRank = r.subjectRank;
      oof.objectRank = r.objectRank;
    }
    const plaus = calibrated(oof, basis);
    models.set(-1, model);
    return { oof, plaus, backend: model.backend, folds: 0, fitSeconds: 0, scoreSeconds: (performance.now() - started) / 1000, models, release: async () => {} };
  }
  const folds = options.folds ?? AUDIT_DEFAULTS.folds;
  const cf: CrossFitResult = await crossFit(graph, {
    folds,
    workers: options.workers ?? (steps.workers ? defaultWorkers(folds) : 0),
    seed: options.seed ?? AUDIT_DEFAULTS.seed,
    ...(options.model ? { model: options.model } : {}),
    ...(options.backend ? { backend: options.backend } : {}),
    warmStart: options.warmStart ?? AUDIT_DEFAULTS.warmStart,
    ranks: needRanks,
    ...(options.only ? { only: withReference(graph, options.only, options.seed ?? AUDIT_DEFAULTS.seed) } : {}),
    maxSeconds: options.maxSeconds ?? AUDIT_DEFAULTS.timeBudget,
    progress,
    fit: steps.fit,
    ...(steps.rank ? { rank: steps.rank } : {}),
    ...(keepModels ? { keep: (fold: number, model: TrainedModel) => models.set(fold, model) } : {}),
  });
  const oof = { ...cf, fold: Int8Array.from(cf.fold) };
  const release = async (): Promise<void> => {
    for (const [key, model] of models) if (key >= 0) model.dispose();
    models.clear();
    for (const w of cf.workers) await w.stop();
  };
  return { oof, plaus: calibrated(oof, basis), backend: cf.backend, folds: cf.folds, fitSeconds: cf.seconds.fit, scoreSeconds: cf.seconds.score, models, release };
}

/**
 * With `only`, plausibility must place the reported triples among the graph's triples, not among each
 * other (ten incoming triples would always have a "worst" one). So a sample of context triples is
 * scored out-of-fold too — up to {@link REFERENCE_PER_PREDICATE} of each predicate the reported triples
 * use, and {@link REFERENCE_GLOBAL} drawn from the whole graph — and serves as the reference; those
 * triples are never reported.
 */
export const REFERENCE_PER_PREDICATE = 200;

/** The reported triples and their reference sample: what gets scored. */
function withReference(graph: Graph, only: Uint8Array, seed: number): Uint8Array {
  const reference = referenceSample(graph, only, seed);
  return reference.map((r, i) => r | (only[i] ? 1 : 0));
}
export const REFERENCE_GLOBAL = 1000;

export function referenceSample(graph: Graph, only: Uint8Array, seed: number): Uint8Array {
  const scorable = scorableTriples(graph);
  const random = new Random(seed + 104_729);
  const out = new Uint8Array(graph.size);
  const predicates = new Set<number>();
  for (let i = 0; i < graph.size; i++) if (only[i] && scorable[i]) predicates.add(graph.p[i]!);
  const take = (candidates: number[], n: number): void => {
    random.shuffle(candidates);
    for (const t of candidates.slice(0, n)) out[t] = 1;
  };
  for (const p of predicates) take(Array.from(row(graph.byPredicate, p)).filter((t) => scorable[t] && !only[t]), REFERENCE_PER_PREDICATE);
  const rest: number[] = [];
  for (let i = 0; i < graph.size; i++) if (scorable[i] && !only[i] && !out[i]) rest.push(i);
  take(rest, REFERENCE_GLOBAL);
  return out;
}

/** The basis in force: the one asked for, else by the cost of ranking (see chooseBasis). */
export function resolveBasis(graph: Graph, options: AuditOptions & { only?: Uint8Array }): PlausibilityBasis {
  const asked = options.basis ?? AUDIT_DEFAULTS.basis;
  if (asked !== 'auto') return asked;
  const scorable = scorableTriples(graph);
  let n = 0;
  for (let i = 0; i < graph.size; i++) if (scorable[i] && (!options.only || options.only[i])) n++;
  return chooseBasis(n, entityCount(graph, scorable));
}

/** Plausibility over the scored triples with a finite logit; NaN for the others. */
function calibrated(oof: OutOfFoldScores, basis: PlausibilityBasis): Float64Array {
  const ok: number[] = [];
  oof.logit.forEach((v, i) => {
    if (Number.isFinite(v)) ok.push(i);
  });
  const out = new Float64Array(oof.logit.length).fill(Number.NaN);
  if (ok.length === 0) return out;
  const sub: OutOfFoldScores = {
    triples: Int32Array.from(ok, (i) => oof.triples[i]!),
    predicate: Int32Array.from(ok, (i) => oof.predicate[i]!),
    logit: Float32Array.from(ok, (i) => oof.logit[i]!),
    candidates: oof.candidates,
  };
  if (oof.subjectRank && oof.objectRank) {
    sub.subjectRank = Float64Array.from(ok, (i) => oof.subjectRank![i]!);
    sub.objectRank = Float64Array.from(ok, (i) => oof.objectRank![i]!);
  }
  const p = plausibility(sub, { basis });
  ok.forEach((i, j) => {
    out[i] = p[j]!;
  });
  return out;
}

/** Sorts findings: gravest severity first, then least plausible, then check id and triple order. */
export function rankFindings(findings: Finding[]): Finding[] {
  const plaus = (f: Finding): number => f.plausibility ?? 2;
  return findings.sort(
    (a, b) =>
      severityRank(a.severity) - severityRank(b.severity) ||
      plaus(a) - plaus(b) ||
      (a.check < b.check ? -1 : a.check > b.check ? 1 : 0) ||
      (a.triple ?? -1) - (b.triple ?? -1),
  );
}

function sourceOf(graph: Graph, t: number): Finding['source'] {
  const file = graph.provenance.files[graph.provenance.file[t]!];
  const line = graph.provenance.line[t]!;
  return file === undefined || line === 0 ? undefined : { file, line };
}

function suspectFinding(graph: Graph, t: number, plaus: number, rank: number, explanation: Explanation | undefined): Finding {
  const key = (id: number): string => graph.terms.key(id);
  const pName = shortName(key(graph.p[t]!));
  const better = (100 * (1 - plaus)).toFixed(1);
  const finding: Finding = {
    kind: 'suspect',
    check: 'model',
    severity: 'warning',
    subject: key(graph.s[t]!),
    predicate: key(graph.p[t]!),
    object: key(graph.o[t]!),
    message:
      `implausible for ${pName}: plausibility ${plaus.toFixed(3)} (${better}% of ${pName} triples scored better out-of-fold)` +
      (explanation ? `; ${explanationLine(explanation, shortName)}` : ''),
    plausibility: round(plaus),
    rank,
    evidence: explanation ? explanationEvidence(explanation) : {},
    triple: t,
  };
  const g = graph.g[t]!;
  if (g >= 0) finding.graph = key(g);
  const source = sourceOf(graph, t);
  if (source) finding.source = source;
  return finding;
}

function explanationEvidence(e: Explanation): Record<string, unknown> {
  const r = (c: { term: string; score: number }): { term: string; score: number } => ({ term: c.term, score: round(c.score) });
  return {
    score: round(e.score),
    objectRank: e.objectRank,
    subjectRank: e.subjectRank,
    candidates: e.candidates,
    preferredObjects: e.preferredObjects.map(r),
    preferredSubjects: e.preferredSubjects.map(r),
    subjectTypes: e.subjectTypes,
    objectTypes: e.objectTypes,
    usualSubjectTypes: e.usualSubjectTypes,
    usualObjectTypes: e.usualObjectTypes,
    subjectTypeSupport: e.subjectTypeSupport,
    objectTypeSupport: e.objectTypeSupport,
    predicateTriples: e.predicateTriples,
    subjectDegree: e.subjectDegree,
    objectDegree: e.objectDegree,
  };
}

/** Mean number of triples per entity: the trust figure's sparsity warning reads it. */
function meanDegree(graph: Graph, scorable: Uint8Array): number {
  const entities = new Set<number>();
  let n = 0;
  for (let i = 0; i < graph.size; i++) {
    if (!scorable[i]) continue;
    n++;
    entities.add(graph.s[i]!);
    entities.add(graph.o[i]!);
  }
  return entities.size === 0 ? 0 : (2 * n) / entities.size;
}

/**
 * The trust figure: plant errors of every kind in a copy, score the copy with the same pipeline, and
 * measure how well the planted triples come first. The copy's findings are thrown away.
 */
async function trustFigure(graph: Graph, options: AuditGraphOptions, steps: AuditSteps, progress: ProgressSink): Promise<TrustFigure> {
  const scorable = scorableTriples(graph);
  const eligible = options.only ? scorable.map((v, i) => v & (options.only![i] ? 1 : 0)) : scorable;
  let eligibleCount = 0;
  for (const v of eligible) eligibleCount += v;
  const rate = Math.min(0.1, Math.max(options.calibrateRate ?? AUDIT_DEFAULTS.calibrateRate, 90 / Math.max(1, eligibleCount)));
  const seed = (options.seed ?? AUDIT_DEFAULTS.seed) + 7919;
  const copy = corruptGraph(graph, { rate, kinds: CORRUPTION_KINDS, seed, eligible });
  const only = options.only ? new Uint8Array(copy.graph.size) : undefined;
  if (only) {
    only.set(options.only!.subarray(0, graph.size));
    only.fill(1, copy.firstInjected);
  }
  const copyOptions: AuditGraphOptions = { ...options, seed };
  if (only) copyOptions.only = only;
  else delete copyOptions.only;
  const scored = await scoreGraph(copy.graph, copyOptions, steps, (e) => progress({ ...e, phase: `calibrate ${e.phase}` }), false);
  const kindOf: Array<string | null> = [];
  const suspicion: number[] = [];
  scored.oof.triples.forEach((t, j) => {
    const p = scored.plaus[j]!;
    suspicion.push(Number.isNaN(p) ? Number.NaN : 1 - p);
    kindOf.push(t >= copy.firstInjected ? copy.injected[t - copy.firstInjected]!.kind : null);
  });
  const table = detectionTable(suspicion, kindOf);
  const share = table.overall.total === 0 ? 0 : table.overall.errors / table.overall.total;
  const byKind: TrustFigure['byKind'] = {};
  for (const [kind, m] of Object.entries(table.byKind)) byKind[kind] = { injected: m.errors, averagePrecision: round(m.ap), precisionAtK: round(m.precisionAtK) };
  const ap = table.overall.ap;
  const degree = meanDegree(graph, eligible);
  return {
    injected: copy.injected.length,
    averagePrecision: round(ap),
    precisionAtK: round(table.overall.precisionAtK),
    baseline: round(share),
    byKind,
    verdict: verdict(ap, share, table.overall.precisionAtK, copy.injected.length, degree, byKind),
  };
}

function verdict(ap: number, share: number, pAtK: number, injected: number, degree: number, byKind: TrustFigure['byKind']): string {
  const lift = share > 0 ? ap / share : 0;
  const head = `Of ${injected} errors planted in a copy of this graph, ${(100 * pAtK).toFixed(0)}% were among the ${injected} least plausible triples (average precision ${ap.toFixed(2)}; a random order scores ${share.toFixed(2)}).`;
  let reading: string;
  if (lift >= 8 && ap >= 0.5) reading = 'The suspect ranking is strong on this graph: its top findings are worth reviewing first.';
  else if (lift >= 3) reading = 'The suspect ranking is useful here but mixes true triples among its top findings: review them as leads, not verdicts.';
  else reading = 'The suspect ranking is weak on this graph: it does little better than chance, so treat suspects as hints only and rely on the checks.';
  const hard = byKind.range;
  const parts = [head, reading];
  if (hard && byKind.random && hard.averagePrecision < byKind.random.averagePrecision / 2) {
    parts.push(`Type-plausible errors (a wrong entity of the right kind) are much harder to see (average precision ${hard.averagePrecision.toFixed(2)}).`);
  }
  if (degree < 4) parts.push(`The graph is sparse (about ${degree.toFixed(1)} triples per entity): a triple about an entity seen once or twice carries little evidence either way.`);
  if (injected < 60) parts.push(`With only ${injected} planted errors the figure itself is rough.`);
  return parts.join(' ');
}

/** Audits a graph already in memory. */
export async function auditGraphDetailed(graph: Graph, options: AuditGraphOptions, steps: AuditSteps): Promise<AuditRun> {
  const progress = options.progress ?? (() => {});
  const durations: Record<string, number> = {};
  if (options.readSeconds !== undefined) durations.read = round(options.readSeconds, 3);
  const time = async <T>(phase: string, work: () => Promise<T>): Promise<T> => {
    const started = performance.now();
    try {
      return await work();
    } finally {
      durations[phase] = round((durations[phase] ?? 0) + (performance.now() - started) / 1000, 3);
    }
  };
  const only = options.only;
  const reported = (t: number | undefined): boolean => t === undefined || !only || only[t] === 1;

  // Checks.
  let violations: Finding[] = [];
  const checks: CheckInfo[] = [];
  if (options.checks !== false && steps.checks) {
    const out = await time('checks', () => steps.checks!(graph, options.schemaGraphs ?? [], options.shapesGraphs ?? [], progress));
    violations = out.findings.filter((f) => reported(f.triple));
    checks.push(...out.checks);
  }

  // Model.
  let scores: TripleScores | undefined;
  let suspects: Finding[] = [];
  let backend: string | undefined;
  let folds: number | undefined;
  let trust: TrustFigure | undefined;
  let histogramCounts: number[] | undefined;
  const plausibilityOf = new Map<number, number>();
  if (!options.noModel) {
    checks.push(MODEL_CHECK);
    const started = performance.now();
    const scored = await scoreGraph(graph, options, steps, progress, true);
    durations.fit = round(scored.fitSeconds, 3);
    durations.score = round(scored.scoreSeconds, 3);
    backend = scored.backend;
    folds = scored.folds;
    const { oof, plaus } = scored;
    // Reference triples (with `only`) calibrate the others but are not reported.
    const kept = Array.from(oof.triples.keys()).filter((j) => reported(oof.triples[j]));
    scores = {
      triples: Int32Array.from(kept, (j) => oof.triples[j]!),
      plausibility: Float64Array.from(kept, (j) => plaus[j]!),
      logit: Float32Array.from(kept, (j) => oof.logit[j]!),
      fold: Int8Array.from(kept, (j) => oof.fold[j]!),
      order: new Int32Array(kept.length),
    };
    const threshold = options.threshold ?? AUDIT_DEFAULTS.threshold;
    const order: number[] = [];
    oof.triples.forEach((t, j) => {
      const p = plaus[j]!;
      if (Number.isNaN(p)) return;
      plausibilityOf.set(t, p);
      if (p < threshold && reported(t)) order.push(j);
    });
    histogramCounts = histogram(scores.plausibility);
    order.sort((a, b) => plaus[a]! - plaus[b]! || oof.triples[a]! - oof.triples[b]!);
    const top = order.slice(0, options.top ?? AUDIT_DEFAULTS.top);
    // Explain each suspect with the model that did not see it.
    const explanations = new Map<number, Explanation>();
    const explainStarted = performance.now();
    try {
      const byModel = new Map<number, number[]>();
      for (const j of top) {
        const key = scored.models.has(-1) ? -1 : oof.fold[j]!;
        let list = byModel.get(key);
        if (!list) byModel.set(key, (list = []));
        list.push(oof.triples[j]!);
      }
      for (const [key, list] of byModel) {
        const model = scored.models.get(key);
        if (!model) continue;
        const ex = await explainTriples(model, graph, Int32Array.from(list), { candidates: options.candidates ?? AUDIT_DEFAULTS.candidates });
        list.forEach((t, i) => explanations.set(t, ex[i]!));
      }
    } finally {
      await scored.release();
    }
    durations.explain = round((performance.now() - explainStarted) / 1000, 3);
    suspects = top.map((j, i) => suspectFinding(graph, oof.triples[j]!, plaus[j]!, i + 1, explanations.get(oof.triples[j]!)));
    void started;

    const scorableCount = oof.triples.length;
    if (options.calibrate ?? (!options.trainedModel && scorableCount <= AUDIT_DEFAULTS.calibrateUpTo)) {
      trust = await time('calibrate', () => trustFigure(graph, options, steps, progress));
    }
  }

  // Violations carry the triple's plausibility where the model scored it.
  for (const f of violations) {
    if (f.triple !== undefined && f.plausibility === undefined) {
      const p = plausibilityOf.get(f.triple);
      if (p !== undefined) f.plausibility = round(p);
    }
  }
  const findings = rankFindings([...(options.readFindings ?? []), ...violations, ...suspects]);
  if (scores) fillOrder(scores, findings);

  const report = assembleReport(graph, options, {
    findings,
    checks,
    durations,
    scored: scores ? scores.triples.length : 0,
    ...(backend !== undefined ? { backend } : {}),
    ...(folds !== undefined ? { folds } : {}),
    ...(trust ? { trust } : {}),
    ...(histogramCounts ? { histogram: histogramCounts } : {}),
  });
  return { report, scores, graph };
}

/** The whole ranking: triples with findings first (in list order), then by rising plausibility. */
function fillOrder(scores: TripleScores, findings: readonly Finding[]): void {
  const at = new Map<number, number>();
  scores.triples.forEach((t, j) => at.set(t, j));
  const placed = new Uint8Array(scores.triples.length);
  let next = 1;
  for (const f of findings) {
    const j = f.triple === undefined ? undefined : at.get(f.triple);
    if (j === undefined || placed[j]) continue;
    placed[j] = 1;
    scores.order[j] = next++;
  }
  const rest: number[] = [];
  for (let j = 0; j < scores.triples.length; j++) if (!placed[j]) rest.push(j);
  const key = (j: number): number => (Number.isNaN(scores.plausibility[j]!) ? 2 : scores.plausibility[j]!);
  rest.sort((a, b) => key(a) - key(b) || scores.triples[a]! - scores.triples[b]!);
  for (const j of rest) scores.order[j] = next++;
}

export const SCORES_FILE = 'scores.tsv';
export const SCORES_HEADER = ['order', 'subject', 'predicate', 'object', 'graph', 'plausibility', 'logit', 'fold'] as const;

/**
 * Every scored triple as a tab-separated table (terms in N-Triples form), in the audit's ranking
 * order: what `plumb evaluate --report` measures, and the plausibility of triples that are not suspects.
 */
export function scoresText(run: AuditRun): string {
  const { graph, scores } = run;
  if (!scores) return `${SCORES_HEADER.join('\t')}\n`;
  const key = (id: number): string => termToField(graph.terms.key(id));
  const byOrder = Array.from(scores.triples.keys()).sort((a, b) => scores.order[a]! - scores.order[b]!);
  const lines = [SCORES_HEADER.join('\t')];
  for (const j of byOrder) {
    const t = scores.triples[j]!;
    const g = graph.g[t]!;
    const p = scores.plausibility[j]!;
    const l = scores.logit[j]!;
    lines.push([scores.order[j], key(graph.s[t]!), key(graph.p[t]!), key(graph.o[t]!), g < 0 ? '' : key(g), Number.isNaN(p) ? '' : p.toFixed(6), Number.isNaN(l) ? '' : l.toFixed(4), scores.fold[j]].join('\t'));
  }
  return `${lines.join('\n')}\n`;
}

function assembleReport(
  graph: Graph,
  options: AuditGraphOptions,
  parts: { findings: Finding[]; checks: CheckInfo[]; durations: Record<string, number>; scored: number; backend?: string; folds?: number; trust?: TrustFigure; histogram?: number[] },
): AuditReport {
  const byKind = { syntax: 0, violation: 0, suspect: 0 };
  const bySeverity: Record<Severity, number> = { error: 0, warning: 0, note: 0 };
  for (const f of parts.findings) {
    byKind[f.kind]++;
    bySeverity[f.severity]++;
  }
  const rows = new Map<number, PredicateRow>();
  const only = options.only;
  for (let t = 0; t < graph.size; t++) {
    if (only && !only[t]) continue;
    const p = graph.p[t]!;
    let r = rows.get(p);
    if (!r) rows.set(p, (r = { predicate: graph.terms.key(p), triples: 0, violations: 0, suspects: 0 }));
    r.triples++;
  }
  for (const f of parts.findings) {
    if (f.triple === undefined) continue;
    const r = rows.get(graph.p[f.triple]!);
    if (!r) continue;
    if (f.kind === 'violation') r.violations++;
    else if (f.kind === 'suspect') r.suspects++;
  }
  const predicates = [...rows.values()].sort((a, b) => b.triples - a.triples || (a.predicate < b.predicate ? -1 : 1));
  const seed = options.seed ?? AUDIT_DEFAULTS.seed;
  const report: AuditReport = {
    format: 'plumb-report',
    formatVersion: 1,
    tool: { name: 'plumb', version: VERSION },
    command: options.command ?? 'audit',
    createdAt: new Date().toISOString(),
    inputs: options.inputs ?? [],
    accounting: options.accounting ?? { read: graph.size, accepted: graph.size, duplicates: 0, rejected: 0 },
    options: reportedOptions(graph, options),
    seed,
    durations: parts.durations,
    summary: { findings: parts.findings.length, byKind, bySeverity, scored: parts.scored },
    predicates,
    findings: parts.findings,
    checks: parts.checks,
  };
  if (parts.backend !== undefined) report.backend = parts.backend;
  if (parts.folds !== undefined) report.folds = parts.folds;
  if (parts.trust) report.summary.trust = parts.trust;
  if (parts.histogram) report.plausibilityHistogram = parts.histogram;
  return report;
}

/** The options in force, after defaults: plain values only. */
function reportedOptions(graph: Graph, options: AuditGraphOptions): Record<string, unknown> {
  const out: Record<string, unknown> = {
    checks: options.checks !== false,
    model: options.noModel ? 'none' : options.trainedModel ? 'given' : 'fitted out-of-fold',
    folds: options.trainedModel ? 0 : (options.folds ?? AUDIT_DEFAULTS.folds),
    warmStart: options.warmStart ?? AUDIT_DEFAULTS.warmStart,
    basis: resolveBasis(graph, options),
    threshold: options.threshold ?? AUDIT_DEFAULTS.threshold,
    top: options.top ?? AUDIT_DEFAULTS.top,
    candidates: options.candidates ?? AUDIT_DEFAULTS.candidates,
    seed: options.seed ?? AUDIT_DEFAULTS.seed,
    calibrate: options.calibrate ?? 'auto',
  };
  if (options.model) out.modelConfig = { ...options.model };
  if (options.trainedModel) out.modelConfig = { ...options.trainedModel.config };
  if (options.backend) out.backend = options.backend;
  out.timeBudget = options.maxSeconds ?? AUDIT_DEFAULTS.timeBudget;
  if (options.only) out.only = options.only.reduce((a, b) => a + b, 0);
  return out;
}

/** The steps as plumb provides them: `fit` and `filteredRanks` from the model, `checkGraph` from the checks. */
export function defaultSteps(checkOptions: RunChecksOptions = {}): AuditSteps {
  return {
    fit,
    workers: true,
    rank: (model, graph, triples) => filteredRanks(model, graph, triples),
    checks: async (graph, schemaGraphs, shapesGraphs, progress) => {
      const result = await checkGraph(graph, schemaGraphs, shapesGraphs, progress, checkOptions);
      return { findings: result.findings, checks: result.checks };
    },
  };
}

/** Audits a graph already in memory; see {@link AuditGraphOptions} for `only` and `trainedModel` (the gate's use). */
export async function auditGraph(graph: Graph, options: AuditGraphOptions = {}, steps: AuditSteps = defaultSteps(options.checkOptions)): Promise<AuditReport> {
  return (await auditGraphDetailed(graph, options, steps)).report;
}

/** What `plumb audit` takes beyond the graph files. */
export interface AuditRunOptions extends AuditOptions {
  /** Ontology files whose RDFS/OWL axioms apply besides those in the graph (`--schema`). */
  schema?: readonly string[];
  /** SHACL shapes files (`--shapes`). */
  shapes?: readonly string[];
  /** How to read the graph files. */
  read?: ReadOptions;
  /** A model saved by `plumb fit --save`: scores without fitting (in-sample for triples it trained on). */
  modelDir?: string;
}

/** `plumb audit` as a function, with the full ranking of scored triples beside the report. */
export async function auditDetailed(paths: readonly string[], options: AuditRunOptions = {}): Promise<AuditRun> {
  const { data, schemaRead, shapesRead, rejections, readSeconds } = await readInputs(paths, options);
  const graphOptions: AuditGraphOptions = {
    ...options,
    inputs: data.inputs,
    accounting: data.accounting,
    readFindings: rejections.map(rejectionFinding),
    readSeconds,
    schemaGraphs: schemaRead ? [schemaRead.graph] : [],
    shapesGraphs: shapesRead ? [shapesRead.graph] : [],
  };
  let loaded: TrainedModel | undefined;
  if (options.modelDir !== undefined && !options.noModel) {
    const loadStarted = performance.now();
    loaded = await loadModel(options.modelDir, data.graph, options.backend ? { backend: options.backend } : {});
    graphOptions.trainedModel = loaded;
    graphOptions.readSeconds = readSeconds + (performance.now() - loadStarted) / 1000;
  }
  try {
    const run = await auditGraphDetailed(data.graph, graphOptions, defaultSteps(options.checkOptions));
    if (schemaRead) run.report.options.schema = schemaRead.inputs;
    if (shapesRead) run.report.options.shapes = shapesRead.inputs;
    if (options.modelDir !== undefined) run.report.options.modelDir = options.modelDir;
    return run;
  } finally {
    loaded?.dispose();
  }
}

/** `plumb audit` as a function: reads the files, checks, fits out-of-fold, scores, ranks. */
export async function audit(paths: readonly string[], options: AuditRunOptions = {}): Promise<AuditReport> {
  return (await auditDetailed(paths, options)).report;
}

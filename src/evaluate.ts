import { readFile } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { SCORES_FILE } from './audit.js';
import { checkGraph } from './checks/run.js';
import { PlumbError } from './errors.js';
import { compareMethods, DEFAULT_FOLDS, evaluateRanking, parseScores, type ComparisonRow, type DetectionMethod, type RankingEvaluation } from './evaluation/compare.js';
import { parseTruth, type TruthEntry } from './evaluation/corrupt.js';
import { evaluateLinkPrediction, type LinkPredictionMetrics } from './evaluation/link-prediction.js';
import type { Graph } from './graph/store.js';
import type { TermDictionary } from './graph/terms.js';
import { fit, loadModel } from './model/index.js';
import type { BackendName } from './model/types.js';
import type { ProgressSink } from './progress.js';
import { filteredRanks, indexesOfKeys, knownFrom } from './scoring/ranking.js';
import { readGraph, type ReadOptions } from './sources/index.js';

/**
 * The two evaluations behind `plumb evaluate`, on files: link prediction of a saved model on test
 * triples, and detection of known errors (a truth file from `plumb corrupt`) by an audit's ranking
 * or by each baseline method. The CLI parses flags and prints; everything it reports comes from here.
 */

export interface LinkPredictionFilesOptions {
  /** A model directory written by `plumb fit --save`. */
  model: string;
  /** The test triples. */
  test: string;
  /** Known true triples (train, valid): filtered out of the candidates and passed as messages. */
  known?: readonly string[];
  read?: ReadOptions;
  backend?: BackendName | 'auto';
  progress?: ProgressSink;
}

export interface LinkPredictionRun {
  metrics: LinkPredictionMetrics;
  backend: BackendName;
  /** `known`: filtered by the known files and the test; `test`: no known files, so by the test triples only. */
  filteredBy: 'known' | 'test';
}

/**
 * Reads the test file (first, so its triples win duplicates) and the known files into one graph and
 * ranks the test triples in the filtered protocol. With known files, the model passes messages over
 * them and never over the test triples; without, it uses the embeddings saved at fit time.
 */
export async function evaluateLinkPredictionFiles(options: LinkPredictionFilesOptions): Promise<LinkPredictionRun> {
  const known = options.known ?? [];
  const backend = options.backend ?? 'auto';
  const read = await readGraph([options.test, ...known], { ...options.read, ...(options.progress ? { progress: options.progress } : {}) });
  const graph = read.graph;
  const isTest = new Uint8Array(graph.size);
  let tests = 0;
  for (let t = 0; t < graph.size; t++) {
    if (graph.provenance.file[t] !== 0) continue;
    isTest[t] = 1;
    tests++;
  }
  if (tests === 0) throw new PlumbError('E_INPUT', `the test file ${options.test} holds no triple`, { hint: 'pass a file of test triples with --test' });
  const testTriples = new Int32Array(tests);
  for (let t = 0, k = 0; t < graph.size; t++) if (isTest[t]) testTriples[k++] = t;
  const keysOf = (t: number) => [graph.terms.key(graph.s[t]!), graph.terms.key(graph.p[t]!), graph.terms.key(graph.o[t]!)] as const;

  if (known.length === 0) {
    const model = await loadModel(options.model, undefined, { backend });
    try {
      const dictionary = (model as { dictionary?: TermDictionary }).dictionary!;
      const entityOf = (key: string): number => model.entities.ofTerm[dictionary.id(key)] ?? -1;
      const relationOf = (key: string): number => (dictionary.id(key) < 0 ? -1 : (model.relations.ofTerm[dictionary.id(key)] ?? -1));
      const keys = Array.from(testTriples, keysOf);
      const index = {
        s: Int32Array.from(keys, (k) => entityOf(k[0])),
        r: Int32Array.from(keys, (k) => relationOf(k[1])),
        o: Int32Array.from(keys, (k) => entityOf(k[2])),
      };
      const metrics = await evaluateLinkPrediction(model, graph, index, knownFrom(model, index), options.progress);
      return { metrics, backend: model.backend, filteredBy: 'test' };
    } finally {
      model.dispose();
    }
  }

  const model = await loadModel(options.model, graph, { backend, exclude: isTest });
  try {
    const { s, r, o } = indexesOfKeys(model, graph, Array.from({ length: graph.size }, (_, t) => keysOf(t)));
    const filter = knownFrom(model, { s, r, o });
    const pick = (column: Int32Array): Int32Array => Int32Array.from(testTriples, (t) => column[t]!);
    const ts = pick(s);
    const to = pick(o);
    // Rank only test triples whose entities the saved model knew: an entity first seen in the test has no evidence.
    const unseen = model.unseen;
    if (unseen) {
      for (let i = 0; i < ts.length; i++) if ((ts[i]! >= 0 && unseen[ts[i]!]) || (to[i]! >= 0 && unseen[to[i]!])) ts[i] = -1;
    }
    const metrics = await evaluateLinkPrediction(model, graph, { s: ts, r: pick(r), o: to }, filter, options.progress);
    return { metrics, backend: model.backend, filteredBy: 'known' };
  } finally {
    model.dispose();
  }
}

async function readText(path: string, what: string): Promise<string> {
  try {
    return await readFile(path, 'utf8');
  } catch (error) {
    throw new PlumbError('E_INPUT', `cannot read the ${what} ${path}: ${(error as NodeJS.ErrnoException).code ?? (error as Error).message}`, {
      hint: what === 'scores file' ? `run \`plumb audit\` with this --out folder first: it writes ${SCORES_FILE} beside report.json` : 'check the path',
      cause: error,
    });
  }
}

/** Reads and parses a truth file written by `plumb corrupt`; refuses one that lists no triple. */
export async function readTruth(path: string): Promise<TruthEntry[]> {
  const truth = parseTruth(await readText(path, 'truth file'), path);
  if (truth.length === 0) throw new PlumbError('E_INPUT', `the truth file ${path} lists no triple`, { hint: 'write one with `plumb corrupt --truth <file>`' });
  return truth;
}

/** How well an audit's ranking (the scores file beside its report.json) puts the truth file's errors first. */
export async function evaluateAuditRanking(reportPath: string, truth: readonly TruthEntry[]): Promise<RankingEvaluation> {
  const reportText = await readText(reportPath, 'report');
  try {
    const parsed = JSON.parse(reportText) as { format?: string };
    if (parsed.format !== 'plumb-report') throw new Error('not a plumb report');
  } catch {
    throw new PlumbError('E_FORMAT', `${reportPath} is not a plumb report.json`, { hint: 'pass the report.json that `plumb audit --out <dir>` wrote' });
  }
  const scoresPath = join(dirname(reportPath), SCORES_FILE);
  return evaluateRanking(parseScores(await readText(scoresPath, 'scores file'), scoresPath), truth);
}

/** Suspicion from the mined type-distribution check alone: flagged triples first, by the broken rule's confidence. */
export async function typeDistributionSuspicion(graph: Graph): Promise<Float64Array> {
  const { findings } = await checkGraph(graph, [], [], undefined, { only: ['mined-type'] });
  const out = new Float64Array(graph.size);
  for (const f of findings) {
    if (f.triple === undefined) continue;
    const confidence = typeof f.evidence.confidence === 'number' ? f.evidence.confidence : 1;
    const score = typeof f.evidence.score === 'number' ? f.evidence.score : 0;
    out[f.triple] = Math.max(out[f.triple]!, 1 + confidence * (1 - score));
  }
  return out;
}

/** Label each graph triple with its truth kind (null for the others). */
export function kindsOf(graph: Graph, truth: readonly TruthEntry[]): { kindOf: Array<string | null>; missing: number } {
  const key = (s: string, p: string, o: string): string => `${s}\t${p}\t${o}`;
  const byKey = new Map<string, string>();
  for (const t of truth) byKey.set(key(t.subject, t.predicate, t.object), t.kind);
  const kindOf: Array<string | null> = new Array(graph.size).fill(null);
  const found = new Set<string>();
  const k = graph.terms;
  for (let i = 0; i < graph.size; i++) {
    const id = key(k.key(graph.s[i]!), k.key(graph.p[i]!), k.key(graph.o[i]!));
    const kind = byKey.get(id);
    if (kind !== undefined) {
      kindOf[i] = kind;
      found.add(id);
    }
  }
  return { kindOf, missing: byKey.size - found.size };
}

export interface BaselineComparisonOptions {
  methods: readonly DetectionMethod[];
  folds?: number;
  seed?: number;
  /** Seconds per model method, all folds together. */
  maxSeconds?: number;
  read?: ReadOptions;
}

/**
 * Ranks a (corrupted) graph with each detection method and measures each against the truth file.
 * `missing` counts truth triples that are not in the graph; when none is, the call is refused.
 */
export async function compareBaselines(files: readonly string[], truth: readonly TruthEntry[], options: BaselineComparisonOptions): Promise<{ rows: ComparisonRow[]; missing: number }> {
  const { graph } = await readGraph([...files], options.read ?? {});
  const { kindOf, missing } = kindsOf(graph, truth);
  if (missing === truth.length) {
    throw new PlumbError('E_INPUT', `none of the ${truth.length} truth triples is in the graph`, { hint: 'pass the corrupted graph that `plumb corrupt --out` wrote, read with the same options' });
  }
  const rows = await compareMethods(graph, kindOf, {
    methods: [...options.methods],
    folds: options.folds ?? DEFAULT_FOLDS,
    seed: options.seed ?? 1,
    fit,
    rank: (m, g, t) => filteredRanks(m, g, t),
    typeDistribution: typeDistributionSuspicion,
    ...(options.maxSeconds !== undefined ? { maxSeconds: options.maxSeconds } : {}),
  });
  return { rows, missing };
}

/**
 * Model benchmark (`npm run bench -- model`): speed and quality of the R-GCN and DistMult models on
 * the WebAssembly backend, printed side by side.
 *
 * 1. The backend's own matmul rate (1024³, median of 5) — the yardstick for everything below.
 * 2. R-GCN layer formulations (forward + backward, one layer, d = 100) on a graph shaped like the
 *    goal below, with the encoder's achieved GFLOP/s (arithmetic counted per formulation).
 * 3. WordNet 3.0 (fixtures/wordnet/build.ts; WN18RR-like relations, synsets of degree ≥ 4): seconds
 *    per epoch, training triples per second, filtered test MRR and wall time, R-GCN beside DistMult.
 * 4. The goal: a 300k-triple, 15k-entity, 500-relation-type (250 predicates and their inverses)
 *    graph, R-GCN fitted inside 15 minutes, against DistMult with the same budget; the R-GCN fit
 *    gets 30 s less, for its final embeddings and the test ranking.
 *
 * `PLUMB_BENCH_QUICK=1` shrinks sections 3 and 4 (for a smoke run). Timings on a shared machine are
 * noisy: compare each figure with the matmul rate printed in the same run.
 */
import { buildWordNetTriples } from '../../fixtures/wordnet/build.js';
import { GraphBuilder, type Graph } from '../../src/graph/store.js';
import { initBackend, tf } from '../../src/model/backend.js';
import { EdgeLayout } from '../../src/model/edges.js';
import { Random } from '../../src/model/random.js';
import { graphTensors, initLayer, layerForward, type Formulation, type LayerShape } from '../../src/model/rgcn.js';
import { fit } from '../../src/model/index.js';
import type { FitOptions, TrainedModel } from '../../src/model/types.js';
import { evaluateLinkPrediction } from '../../src/evaluation/link-prediction.js';
import { indexesOfKeys, knownFrom } from '../../src/scoring/ranking.js';

const QUICK = process.env.PLUMB_BENCH_QUICK === '1';
type Triple = [string, string, string];

const median = (xs: number[]): number => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2]! : (s[s.length / 2 - 1]! + s[s.length / 2]!) / 2;
};

async function matmulRate(): Promise<number> {
  const a = tf.randomNormal([1024, 1024]) as tf.Tensor2D;
  const rates: number[] = [];
  for (let i = 0; i < 6; i++) {
    const t = performance.now();
    const c = tf.matMul(a, a);
    await c.data();
    c.dispose();
    if (i > 0) rates.push((2 * 1024 ** 3) / ((performance.now() - t) / 1000) / 1e9);
  }
  a.dispose();
  return median(rates);
}

/**
 * A graph with the kinds of structure real knowledge graphs have: each entity has a latent type (50,
 * sizes skewed) and a community (60); three predicates in five are *base* predicates linking a domain
 * type to a range type, four times in five within the subject's community; the rest are *derived*
 * two-hop predicates q = p1 ∘ p2 (q(x, z) holds for some x, z with p1(x, y) and p2(y, z)), like
 * nationality = born-in ∘ located-in. Subjects are drawn with skewed popularity, so many entities
 * have few triples.
 */
export function structuredGraph(entities: number, predicates: number, triples: number, seed = 1): Triple[] {
  const random = new Random(seed);
  const types = 50;
  const communities = 60;
  const typeOf = Int32Array.from({ length: entities }, () => Math.floor(types * random.next() ** 1.5));
  const communityOf = Int32Array.from({ length: entities }, () => random.int(communities));
  const byType: number[][] = Array.from({ length: types }, () => []);
  const byTypeCommunity = new Map<number, number[]>();
  for (let e = 0; e < entities; e++) {
    byType[typeOf[e]!]!.push(e);
    const key = typeOf[e]! * communities + communityOf[e]!;
    if (!byTypeCommunity.has(key)) byTypeCommunity.set(key, []);
    byTypeCommunity.get(key)!.push(e);
  }
  const baseCount = Math.max(1, Math.round(predicates * 0.6));
  const domain = Int32Array.from({ length: baseCount }, () => Math.floor(types * random.next() ** 1.5));
  const range = Int32Array.from({ length: baseCount }, () => Math.floor(types * random.next() ** 1.5));
  const seen = new Set<string>();
  const out: Triple[] = [];
  const name = (e: number): string => `http://bench.invalid/e${e}`;
  const add = (s: number, p: number, o: number): void => {
    const key = `${s} ${p} ${o}`;
    if (s === o || seen.has(key)) return;
    seen.add(key);
    out.push([name(s), `http://bench.invalid/p${p}`, name(o)]);
  };
  // Base triples: 60 % of the total, predicates with skewed frequency.
  const objectsOf = new Map<number, number[]>();
  const baseTriples = Math.round(triples * 0.6);
  while (out.length < baseTriples) {
    const p = Math.floor(baseCount * random.next() ** 2);
    const subjects = byType[domain[p]!]!;
    if (subjects.length === 0) continue;
    const s = subjects[Math.floor(subjects.length * random.next() ** 2)]!;
    const local = byTypeCommunity.get(range[p]! * communities + communityOf[s]!);
    const pool = random.next() < 0.8 && local && local.length > 0 ? local : byType[range[p]!]!;
    if (pool.length === 0) continue;
    const o = pool[random.int(pool.length)]!;
    const before = out.length;
    add(s, p, o);
    if (out.length > before) {
      const key = p * entities + s;
      if (!objectsOf.has(key)) objectsOf.set(key, []);
      objectsOf.get(key)!.push(o);
    }
  }
  // Derived predicates: a chain p1 ∘ p2 of base predicates whose types meet.
  const chains: [number, number][] = [];
  for (let q = baseCount; q < predicates; q++) {
    for (let tries = 0; tries < 100; tries++) {
      const p1 = random.int(baseCount);
      const next = Array.from({ length: baseCount }, (_, p) => p).filter((p) => domain[p] === range[p1]);
      if (next.length === 0) continue;
      chains.push([p1, next[random.int(next.length)]!]);
      break;
    }
    if (chains.length < q - baseCount + 1) chains.push([random.int(baseCount), random.int(baseCount)]);
  }
  const subjectsOf: number[][] = Array.from({ length: baseCount }, () => []);
  for (const key of objectsOf.keys()) subjectsOf[Math.floor(key / entities)]!.push(key % entities);
  for (let guard = 0; out.length < triples && guard < triples * 50; guard++) {
    const q = random.int(chains.length);
    const [p1, p2] = chains[q]!;
    const subjects = subjectsOf[p1]!;
    if (subjects.length === 0) continue;
    const x = subjects[random.int(subjects.length)]!;
    const ys = objectsOf.get(p1 * entities + x)!;
    const y = ys[random.int(ys.length)]!;
    const zs = objectsOf.get(p2 * entities + y);
    if (!zs) continue;
    add(x, baseCount + q, zs[random.int(zs.length)]!);
  }
  return out;
}

/** Seeded split into train / valid / test, keeping valid and test triples whose entities occur in train. */
export function split(all: Triple[], share: number, seed: number): { train: Triple[]; valid: Triple[]; test: Triple[] } {
  const random = new Random(seed);
  const order = random.shuffle(Int32Array.from({ length: all.length }, (_, i) => i));
  const held = Math.round(all.length * share);
  const train: Triple[] = [];
  const rest: Triple[] = [];
  order.forEach((i, k) => (k < 2 * held ? rest : train).push(all[i]!));
  const known = new Set<string>();
  for (const [s, , o] of train) known.add(s).add(o);
  const ok = rest.filter(([s, , o]) => known.has(s) && known.has(o));
  return { train, valid: ok.slice(0, ok.length >> 1), test: ok.slice(ok.length >> 1) };
}

function graphOf(parts: Triple[][]): { graph: Graph; starts: number[] } {
  const b = new GraphBuilder();
  const starts: number[] = [];
  parts.forEach((part, i) => {
    const f = b.addFile(`part${i}`);
    starts.push(b.size);
    part.forEach(([s, p, o], line) => b.addKeys(s, p, o, undefined, f, line + 1));
  });
  starts.push(b.size);
  return { graph: b.build(), starts };
}

interface RunFigures {
  label: string;
  epochs: number;
  secondsPerEpoch: number;
  triplesPerSecond: number;
  mrr: number;
  hits10: number;
  /** Seconds until `fit` returned (training, the best epoch's weights, the final embeddings). */
  fit: number;
  /** Fit plus ranking the test triples. */
  wall: number;
}

export async function trainAndTest(label: string, data: { train: Triple[]; valid: Triple[]; test: Triple[] }, options: FitOptions): Promise<RunFigures> {
  const { graph, starts } = graphOf([data.train, data.valid]);
  const valid = Int32Array.from({ length: starts[2]! - starts[1]! }, (_, i) => starts[1]! + i);
  const started = performance.now();
  let model: TrainedModel | undefined;
  try {
    model = await fit(graph, { backend: 'wasm', valid, ...options });
    const fitted = (performance.now() - started) / 1000;
    const test = indexesOfKeys(model, graph, data.test);
    const known = knownFrom(model, indexesOfKeys(model, graph, [...data.train, ...data.valid, ...data.test]));
    const metrics = await evaluateLinkPrediction(model, graph, test, known);
    const epochs = model.history.length;
    return {
      label,
      epochs,
      secondsPerEpoch: fitted / Math.max(1, epochs),
      triplesPerSecond: (data.train.length * epochs) / fitted,
      mrr: metrics.mrr,
      hits10: metrics.hits10,
      fit: fitted,
      wall: (performance.now() - started) / 1000,
    };
  } finally {
    model?.dispose();
  }
}

function printRuns(runs: RunFigures[]): void {
  console.log('  model                         epochs   s/epoch   triples/s   test MRR   Hits@10    fit s   wall s');
  for (const r of runs) {
    console.log(
      `  ${r.label.padEnd(28)} ${String(r.epochs).padStart(7)} ${r.secondsPerEpoch.toFixed(2).padStart(9)} ${Math.round(r.triplesPerSecond).toLocaleString('en-US').padStart(11)} ` +
        `${r.mrr.toFixed(4).padStart(10)} ${r.hits10.toFixed(4).padStart(9)} ${r.fit.toFixed(0).padStart(8)} ${r.wall.toFixed(0).padStart(8)}`,
    );
  }
}

/** Arithmetic per training step of one layer (forward + backward), by formulation. */
function layerFlops(form: Formulation, decomposition: LayerShape['decomposition'], b: number, n: number, e: number, p: number, d: number): number {
  const self = 6 * n * d * d;
  const aggregate = 2 * e * d + p * d;
  if (form === 'per-type') return self + aggregate + 6 * p * d * d + (decomposition === 'basis' ? 6 * b * d * d * (2 * 250) : 0);
  return self + aggregate + 6 * n * b * d * d + 6 * b * p * d;
}

async function formulations(rate: number): Promise<void> {
  const N = 15_000;
  const R = 250;
  const d = 100;
  const triples = structuredGraph(N, R, QUICK ? 60_000 : 300_000, 7);
  const { graph } = graphOf([triples]);
  const s = Int32Array.from({ length: graph.size }, (_, t) => graph.s[t]!);
  const o = Int32Array.from({ length: graph.size }, (_, t) => graph.o[t]!);
  const pred = new Map<number, number>();
  const r = Int32Array.from({ length: graph.size }, (_, t) => {
    const id = graph.p[t]!;
    if (!pred.has(id)) pred.set(id, pred.size);
    return pred.get(id)!;
  });
  // Entity ids: remap terms densely (predicates are interned among them).
  const entityOf = new Map<number, number>();
  const dense = (x: number): number => {
    if (!entityOf.has(x)) entityOf.set(x, entityOf.size);
    return entityOf.get(x)!;
  };
  const S = Int32Array.from(s, dense);
  const O = Int32Array.from(o, dense);
  const n = entityOf.size;
  const mg = new EdgeLayout(S, r, O, n, pred.size).build(null);
  console.log(`  graph: ${n.toLocaleString('en-US')} entities, ${graph.size.toLocaleString('en-US')} triples, ${2 * pred.size} relation types, ${mg.edgeCount.toLocaleString('en-US')} edges in ${mg.pairCount.toLocaleString('en-US')} (target, type) pairs`);
  const g = graphTensors(mg);
  const h = tf.variable(tf.randomNormal([n, d], 0, 0.1), true, "bench-h") as tf.Variable<tf.Rank.R2>;
  const target = tf.randomNormal([n, d]);
  const random = new Random(1);
  const cases: [LayerShape['decomposition'], number, Formulation, string][] = [
    ['basis', 2, 'aggregate', 'basis B=2, aggregate first (custom gradient)'],
    ['basis', 4, 'aggregate', 'basis B=4, aggregate first (custom gradient)'],
    ['basis', 2, 'builtin', 'basis B=2, same maths, built-in gradients'],
    ['basis', 4, 'per-type', 'basis B=4, one matmul per type'],
    ['block', 10, 'per-type', 'block B=10, one matmul per type'],
    ['none', 0, 'per-type', 'full W_r, one matmul per type'],
  ];
  console.log('  formulation                                      forward ms   fwd+bwd ms   encoder GFLOP/s   share of matmul rate');
  for (const [decomposition, b, form, label] of cases) {
    const shape: LayerShape = { dIn: d, dOut: d, types: 2 * pred.size, decomposition, b };
    const w = initLayer(shape, random, `bench-${label}`);
    const vars = [h, w.w0, w.w, ...(w.a ? [w.a] : [])];
    const forward: number[] = [];
    const step: number[] = [];
    try {
      for (let i = 0; i < 4; i++) {
        let t = performance.now();
        const out = layerForward(shape, w, h, g, false, form);
        await out.data();
        out.dispose();
        forward.push(performance.now() - t);
        t = performance.now();
        const { value, grads } = tf.variableGrads(() => tf.sum(tf.mul(layerForward(shape, w, h, g, true, form), target)) as tf.Scalar, vars);
        await Promise.all(Object.values(grads).map((x) => x.data()));
        step.push(performance.now() - t);
        value.dispose();
        tf.dispose(Object.values(grads));
      }
      const ms = median(step.slice(1));
      const gflops = layerFlops(form, decomposition, b, n, mg.edgeCount, mg.pairCount, d) / (ms / 1000) / 1e9;
      console.log(`  ${label.padEnd(48)} ${median(forward.slice(1)).toFixed(0).padStart(10)} ${ms.toFixed(0).padStart(12)} ${gflops.toFixed(2).padStart(17)} ${`${((100 * gflops) / rate).toFixed(0)} %`.padStart(22)}`);
    } catch (error) {
      console.log(`  ${label.padEnd(48)} failed: ${(error as Error).message.slice(0, 80)}`);
    } finally {
      for (const v of [w.w0, w.w, w.a]) v?.dispose();
    }
  }
  g.dispose();
  h.dispose();
  target.dispose();
}

export async function run(): Promise<void> {
  await initBackend('wasm');
  const rate = await matmulRate();
  console.log(`backend wasm; matmul 1024³: ${rate.toFixed(1)} GFLOP/s (median of 5)`);

  console.log('\nR-GCN layer formulations (one layer, d = 100):');
  await formulations(rate);

  console.log('\nWordNet 3.0 (WN18RR-like relations, synsets of degree ≥ 4; 90/5/5 split, seed 1):');
  const wordnet = await buildWordNetTriples({ preset: 'wn18rr-like', minDegree: 4, ...(QUICK ? { maxTriples: 20_000 } : {}) });
  const wn = split(wordnet, 0.05, 1);
  console.log(`  ${wn.train.length.toLocaleString('en-US')} train, ${wn.valid.length.toLocaleString('en-US')} valid, ${wn.test.length.toLocaleString('en-US')} test triples`);
  const wnBudget = QUICK ? 60 : 420;
  printRuns([
    await trainAndTest(`R-GCN (defaults, ≤${wnBudget} s)`, wn, { maxSeconds: wnBudget }),
    await trainAndTest(`DistMult (≤${wnBudget} s)`, wn, { encoder: 'none', maxSeconds: wnBudget }),
  ]);

  const goal = QUICK ? { entities: 3_000, predicates: 100, triples: 40_000, budget: 120 } : { entities: 15_000, predicates: 250, triples: 300_000, budget: 900 };
  console.log(
    `\nGoal: ${goal.triples.toLocaleString('en-US')} triples, ${goal.entities.toLocaleString('en-US')} entities, ${2 * goal.predicates} relation types; ` +
      `R-GCN inside ${goal.budget / 60} minutes, beside DistMult with the same budget (98/1/1 split):`,
  );
  const synthetic = split(structuredGraph(goal.entities, goal.predicates, goal.triples, 11), 0.01, 2);
  // The fit's own budget leaves half a minute of the goal for the final embeddings and the test ranking.
  const runs = [
    await trainAndTest('R-GCN (defaults)', synthetic, { maxSeconds: goal.budget - 30 }),
    await trainAndTest('DistMult', synthetic, { encoder: 'none', maxSeconds: goal.budget }),
  ];
  printRuns(runs);
  const [rgcn, distmult] = runs as [RunFigures, RunFigures];
  console.log(`  R-GCN fit and test ranking ${rgcn.wall.toFixed(0)} s (goal ≤ ${goal.budget} s): ${rgcn.wall <= goal.budget ? 'met' : 'missed'}; MRR ${rgcn.mrr.toFixed(4)} vs DistMult ${distmult.mrr.toFixed(4)}: ${rgcn.mrr > distmult.mrr ? 'R-GCN ahead' : 'DistMult ahead'}`);
}

if (import.meta.url === `file://${process.argv[1]}`) await run();

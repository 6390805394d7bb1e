import { beforeAll, describe, expect, it } from 'vitest';
import { initBackend, tf } from '../../src/model/backend.js';
import { EdgeLayout } from '../../src/model/edges.js';
import { Random } from '../../src/model/random.js';
import { denseRelationWeights, graphTensors, initLayer, layerForward, layerParameterCount, type Formulation, type LayerShape, type LayerWeights } from '../../src/model/rgcn.js';
import { basisWeight, blockWeight, naiveEdges, naiveLayer, nest, type Matrix } from '../model/naive-rgcn.js';

/**
 * Outside reference: Schlichtkrull, Kipf, Bloem, van den Berg, Titov & Welling, "Modeling Relational
 * Data with Graph Convolutional Networks", ESWC 2018 — eq. 2 (the layer), eq. 3 (basis
 * decomposition), eq. 4 (block-diagonal decomposition) and the parameter counts they imply (§2.2).
 */

// A small multigraph with repeated (target, type) pairs, so c_{i,r} > 1 occurs, and an isolated entity.
const N = 8;
const R = 3;
const S = Int32Array.of(0, 1, 2, 0, 3, 4, 5, 1, 2, 6, 0, 3);
const P = Int32Array.of(0, 0, 0, 1, 1, 2, 2, 0, 1, 2, 2, 0);
const O = Int32Array.of(3, 3, 3, 4, 4, 0, 0, 5, 5, 1, 6, 2);
const D = 6;

function shapeOf(decomposition: LayerShape['decomposition'], b: number): LayerShape {
  return { dIn: D, dOut: D, types: 2 * R, decomposition, b };
}

async function values(t: tf.Tensor): Promise<Float32Array> {
  return (await t.data()) as Float32Array;
}

async function naiveOutput(shape: LayerShape, weights: LayerWeights, h: Float32Array): Promise<Matrix> {
  const w0 = nest(await values(weights.w0), [D, D]) as Matrix;
  const w = await values(weights.w);
  let weightOf: (r: number) => Matrix;
  if (shape.decomposition === 'none') {
    const all = nest(w, [shape.types, D, D]) as Matrix[];
    weightOf = (r) => all[r]!;
  } else if (shape.decomposition === 'basis') {
    const v = nest(w, [shape.b, D, D]) as Matrix[];
    const a = nest(await values(weights.a!), [shape.types, shape.b]) as Matrix;
    weightOf = (r) => basisWeight(a, v, r);
  } else {
    const k = D / shape.b;
    const q = nest(w, [shape.types, shape.b, k, k]) as Matrix[][];
    weightOf = (r) => blockWeight(q, r);
  }
  return naiveLayer(nest(h, [N, D]) as Matrix, naiveEdges(S, P, O, R), w0, weightOf, shape.types);
}

function maxDiff(a: ArrayLike<number>, b: Matrix): number {
  const flat = b.flat();
  let worst = 0;
  for (let i = 0; i < flat.length; i++) worst = Math.max(worst, Math.abs(a[i]! - flat[i]!));
  return worst;
}

describe.each(['wasm', 'cpu'] as const)('R-GCN layer on the %s backend', (backend) => {
  beforeAll(async () => {
    await initBackend(backend);
  });

  const cases: [LayerShape['decomposition'], number, Formulation | undefined][] = [
    ['none', 0, undefined],
    ['basis', 2, undefined],
    ['basis', 3, 'per-type'],
    ['basis', 2, 'builtin'],
    ['block', 2, undefined],
    ['block', 3, undefined],
  ];

  it.each(cases)('%s (B=%i, %s formulation) equals eq. 2 evaluated with plain arrays to 1e-5', async (decomposition, b, formulation) => {
    const random = new Random(11);
    const shape = shapeOf(decomposition, b);
    const weights = initLayer(shape, random, `eq-${backend}-${decomposition}-${b}-${formulation ?? 'default'}`);
    const hValues = random.uniform(N * D, 1);
    const h = tf.tensor2d(hValues, [N, D]);
    const graph = graphTensors(new EdgeLayout(S, P, O, N, R).build(null));
    const expected = await naiveOutput(shape, weights, hValues);
    // Inference path (plain ops) and training path (custom-gradient op) must both match.
    for (const training of [false, true]) {
      if (training && formulation === 'builtin') continue;
      const out = layerForward(shape, weights, h, graph, training, formulation);
      expect(maxDiff(await values(out), expected)).toBeLessThan(1e-5);
      out.dispose();
    }
    graph.dispose();
    h.dispose();
    for (const v of [weights.w0, weights.w, weights.a]) v?.dispose();
  });

  it.each([
    ['none', 0],
    ['basis', 2],
    ['block', 3],
  ] as const)('the %s layer gradients equal those of a per-edge formulation with built-in gradients', async (decomposition, b) => {
    const random = new Random(5);
    const shape = shapeOf(decomposition, b);
    const weights = initLayer(shape, random, `grad-${backend}-${decomposition}`);
    const h = tf.variable(tf.tensor2d(random.uniform(N * D, 1), [N, D]), true, `grad-${backend}-${decomposition}-h`);
    const target = tf.tensor2d(random.uniform(N * D, 1), [N, D]);
    const graph = graphTensors(new EdgeLayout(S, P, O, N, R).build(null));
    const edges = naiveEdges(S, P, O, R);
    const count = new Map<string, number>();
    for (const e of edges) count.set(`${e.dst},${e.type}`, (count.get(`${e.dst},${e.type}`) ?? 0) + 1);
    const src = tf.tensor1d(edges.map((e) => e.src), 'int32');
    const dst = tf.tensor1d(edges.map((e) => e.dst), 'int32');
    const type = tf.tensor1d(edges.map((e) => e.type), 'int32');
    const scale = tf.tensor3d(edges.map((e) => 1 / count.get(`${e.dst},${e.type}`)!), [edges.length, 1, 1]);
    const vars = [h, weights.w0, weights.w, ...(weights.a ? [weights.a] : [])];

    // Per edge: (1/c) h_src W_type, summed into dst — tf.gather / unsortedSegmentSum gradients.
    const reference = () => {
      const w = denseRelationWeights(shape, weights);
      const messages = tf.mul(tf.matMul(tf.expandDims(tf.gather(h, src), 1), tf.gather(w, type)), scale);
      const out = tf.add(tf.matMul(h, weights.w0), tf.unsortedSegmentSum(tf.reshape(messages, [edges.length, D]), dst, N));
      return tf.sum(tf.mul(out, target)) as tf.Scalar;
    };
    const fast = () => tf.sum(tf.mul(layerForward(shape, weights, h, graph, true), target)) as tf.Scalar;
    const want = tf.variableGrads(reference, vars);
    const got = tf.variableGrads(fast, vars);
    expect(Math.abs((await values(got.value))[0]! - (await values(want.value))[0]!)).toBeLessThan(1e-4);
    for (const v of vars) {
      const a = await values(got.grads[v.name]!);
      const e = await values(want.grads[v.name]!);
      expect(a.length).toBe(e.length);
      let worst = 0;
      for (let i = 0; i < a.length; i++) worst = Math.max(worst, Math.abs(a[i]! - e[i]!));
      expect(worst, `gradient of ${v.name}`).toBeLessThan(1e-4);
    }
    graph.dispose();
    for (const t of [src, dst, type, scale, target, h, weights.w0, weights.w, weights.a]) t?.dispose();
  });
});

describe('parameter counts (Schlichtkrull et al. 2018, §2.2)', () => {
  beforeAll(async () => {
    await initBackend('cpu');
  });

  // UMLS-sized: 46 predicates → R = 92 relation types with inverses.
  const dIn = 20;
  const dOut = 20;
  const T = 92;
  const cases: [LayerShape['decomposition'], number, number][] = [
    // Full W_r: R·d_in·d_out, plus W_0.
    ['none', 0, T * dIn * dOut + dIn * dOut],
    // Basis (eq. 3): B·d_in·d_out + R·B, plus W_0.
    ['basis', 4, 4 * dIn * dOut + T * 4 + dIn * dOut],
    // Block-diagonal (eq. 4): R·B·(d_in/B)·(d_out/B), plus W_0.
    ['block', 5, T * 5 * (dIn / 5) * (dOut / 5) + dIn * dOut],
  ];

  it.each(cases)('%s with B=%i has %i parameters', (decomposition, b, expected) => {
    const shape: LayerShape = { dIn, dOut, types: T, decomposition, b };
    const weights = initLayer(shape, new Random(1), `count-${decomposition}`);
    const actual = [weights.w0, weights.w, weights.a].reduce((sum, v) => sum + (v?.size ?? 0), 0);
    expect(actual).toBe(expected);
    expect(layerParameterCount(shape)).toBe(expected);
    for (const v of [weights.w0, weights.w, weights.a]) v?.dispose();
  });
});

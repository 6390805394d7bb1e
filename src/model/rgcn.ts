import { tf } from './backend.js';
import type { MessageGraph } from './edges.js';
import type { Random } from './random.js';

/**
 * One R-GCN layer (Schlichtkrull, Kipf, Bloem, van den Berg, Titov & Welling, "Modeling Relational
 * Data with Graph Convolutional Networks", ESWC 2018, eq. 2):
 *
 *     h_i^{l+1} = σ( W_0^l h_i^l + Σ_{r ∈ R} Σ_{j ∈ N_i^r} (1 / c_{i,r}) W_r^l h_j^l )
 *
 * - h_i^l ∈ R^{d_in}: entity i at layer l (row i of `H`, shape [N, d_in]); h^{l+1} ∈ R^{d_out}.
 * - R: the relation types, a type r for every predicate and one for its inverse (T = 2·predicates),
 *   so a triple (s, p, o) sends s → o along p and o → s along p⁻¹.
 * - N_i^r: the entities j with an edge j → i of type r; c_{i,r} = |N_i^r| (the paper's choice).
 * - W_0 ∈ R^{d_in×d_out}: the self-connection, applied to every entity.
 * - W_r ∈ R^{d_in×d_out}, one of (§2.2):
 *   - `none`: free, T·d_in·d_out parameters;
 *   - `basis`: W_r = Σ_{b=1}^{B} a_{rb} V_b, B·d_in·d_out + T·B parameters (eq. 3);
 *   - `block`: W_r = diag(Q_{1r}, …, Q_{Br}) with Q_{br} ∈ R^{(d_in/B)×(d_out/B)},
 *     T·B·(d_in/B)·(d_out/B) parameters (eq. 4).
 * - σ: ReLU on hidden layers; the last layer is linear, as in the paper's link-prediction encoder
 *   whose output feeds the DistMult decoder directly.
 * Rows are used as vectors, so the code computes h W (row × matrix) where the paper writes W h.
 *
 * Regularisation (training only): dropout on each layer's input, and edge dropout, which removes a
 * share of the triples from message passing at each step (see `train.ts`).
 *
 * Formulation. Matrices are never applied per edge. With edges sorted by (type, target), a segment
 * mean over the sources of each (target i, type r) pair gives m_{i,r} = (1/c_{i,r}) Σ_j h_j in one
 * fused gather-reduce (`sparseSegmentMean`). Then:
 * - `basis` ("aggregate first"): Σ_r W_r m_{i,r} = Σ_b V_b (Σ_r a_{rb} m_{i,r}); the inner sums are B
 *   weighted segment sums into targets, giving Z ∈ R^{N×B·d_in}, and one matmul with the stacked
 *   bases finishes the layer. No [edges × d] tensor is transformed and nothing is per type.
 * - `none` and `block` ("per type"): pairs of one type are contiguous, so each type is one matmul of
 *   its pair rows with W_r (block-diagonal W_r assembled dense), then a segment sum into targets.
 * Each layer is one custom-gradient op that keeps only what its backward pass needs and sends
 * gradients to sources through edges pre-sorted by source (`sparseSegmentSum`, also fused), since
 * the built-in gradients copy their saved inputs and the WebAssembly backend has no fast scatter.
 * `tests/bench/model.ts` measures these against the same maths from built-in ops.
 */
export type Decomposition = 'none' | 'basis' | 'block';

export interface LayerShape {
  dIn: number;
  dOut: number;
  /** Relation types T, inverses included. */
  types: number;
  decomposition: Decomposition;
  /** B: bases for `basis`, blocks for `block`. */
  b: number;
}

/** Trainable parameters of one layer, as named in the paper. */
export interface LayerWeights {
  /** W_0, [d_in, d_out]. */
  w0: tf.Variable;
  /** `none`: W, [T, d_in, d_out]. `basis`: V, [B, d_in, d_out]. `block`: Q, [T, B, d_in/B, d_out/B]. */
  w: tf.Variable;
  /** `basis` only: a, [T, B]. */
  a?: tf.Variable;
}

/** The parameter count of one layer by the formulas of Schlichtkrull et al. 2018 §2.2, W_0 included. */
export function layerParameterCount(shape: LayerShape): number {
  const { dIn, dOut, types, b } = shape;
  const self = dIn * dOut;
  switch (shape.decomposition) {
    case 'none':
      return self + types * dIn * dOut;
    case 'basis':
      return self + b * dIn * dOut + types * b;
    case 'block':
      return self + types * b * (dIn / b) * (dOut / b);
  }
}

/** The tensors of a {@link MessageGraph} for one step; dispose after use. */
export interface GraphTensors {
  readonly graph: MessageGraph;
  readonly edgeSrc: tf.Tensor1D;
  readonly edgePair: tf.Tensor1D;
  /** [P, 1] for gatherND. */
  readonly pairType: tf.Tensor2D;
  readonly pairTypeFlat: tf.Tensor1D;
  readonly pairTarget: tf.Tensor2D;
  readonly pairScale: tf.Tensor2D;
  readonly pairIndex: tf.Tensor1D;
  readonly byTargetPair: tf.Tensor1D;
  readonly byTargetTarget: tf.Tensor1D;
  readonly bySourcePair: tf.Tensor1D;
  readonly bySourceSource: tf.Tensor1D;
  dispose(): void;
}

export function graphTensors(graph: MessageGraph): GraphTensors {
  const P = graph.pairCount;
  const pairIndex = new Int32Array(P);
  for (let p = 0; p < P; p++) pairIndex[p] = p;
  const t = {
    graph,
    edgeSrc: tf.tensor1d(graph.edgeSrc, 'int32'),
    edgePair: tf.tensor1d(graph.edgePair, 'int32'),
    pairType: tf.tensor2d(graph.pairType, [P, 1], 'int32'),
    pairTypeFlat: tf.tensor1d(graph.pairType, 'int32'),
    pairTarget: tf.tensor2d(graph.pairTarget, [P, 1], 'int32'),
    pairScale: tf.tensor2d(graph.pairScale, [P, 1], 'float32'),
    pairIndex: tf.tensor1d(pairIndex, 'int32'),
    byTargetPair: tf.tensor1d(graph.byTargetPair, 'int32'),
    byTargetTarget: tf.tensor1d(graph.byTargetTarget, 'int32'),
    bySourcePair: tf.tensor1d(graph.bySourcePair, 'int32'),
    bySourceSource: tf.tensor1d(graph.bySourceSource, 'int32'),
  };
  return {
    ...t,
    dispose() {
      for (const value of Object.values(t)) if (value instanceof tf.Tensor) value.dispose();
    },
  };
}

/** Pads a [n, …] tensor with zero rows to [rows, …] (segment reductions stop at the last segment). */
export function padRows<T extends tf.Tensor>(x: T, rows: number): T {
  const n = x.shape[0]!;
  if (n === rows) return x;
  const pad: [number, number][] = x.shape.map(() => [0, 0] as [number, number]);
  pad[0] = [0, rows - n];
  return tf.pad(x, pad) as T;
}

/** m_{i,r}: the mean of source rows per (target, type) pair, [P, d]. */
function pairMeans(h: tf.Tensor2D, g: GraphTensors): tf.Tensor2D {
  if (g.graph.pairCount === 0) return tf.zeros([0, h.shape[1]]);
  return tf.sparse.sparseSegmentMean(h, g.edgeSrc, g.edgePair) as tf.Tensor2D;
}

/** Σ over pairs into their targets: [P, d] → [N, d]. */
function sumIntoTargets(x: tf.Tensor2D, g: GraphTensors): tf.Tensor2D {
  if (g.graph.pairCount === 0) return tf.zeros([g.graph.entityCount, x.shape[1]]);
  return padRows(tf.sparse.sparseSegmentSum(x, g.byTargetPair, g.byTargetTarget) as tf.Tensor2D, g.graph.entityCount);
}

/** The gradient of {@link pairMeans} with respect to h: each pair's gradient / c_{i,r}, summed into its sources. */
function pairMeansGrad(dm: tf.Tensor2D, g: GraphTensors): tf.Tensor2D {
  if (g.graph.edgeCount === 0) return tf.zeros([g.graph.entityCount, dm.shape[1]]);
  const scaled = tf.mul(dm, g.pairScale);
  return padRows(tf.sparse.sparseSegmentSum(scaled, g.bySourcePair, g.bySourceSource) as tf.Tensor2D, g.graph.entityCount);
}

/** h W with W pre-transposed for the backward products (transposed matmuls are slow on wasm). */
const matMul = (a: tf.Tensor2D, b: tf.Tensor2D): tf.Tensor2D => tf.matMul(a, b);
const t2 = (x: tf.Tensor2D): tf.Tensor2D => tf.transpose(x);

// ---- basis: aggregate first ------------------------------------------------------------------------

/** Forward of the basis layer; returns the output and Z (the per-basis weighted sums). */
function basisForward(h: tf.Tensor2D, w0: tf.Tensor2D, v: tf.Tensor3D, a: tf.Tensor2D, g: GraphTensors) {
  const [B, dIn, dOut] = v.shape;
  const m = pairMeans(h, g);
  const coef = g.graph.pairCount === 0 ? tf.zeros([0, B]) : (tf.gatherND(a, g.pairType) as tf.Tensor2D);
  const coefT = tf.transpose(coef);
  const parts: tf.Tensor2D[] = [];
  for (let b = 0; b < B; b++) {
    const cb = tf.reshape(tf.slice(coefT, [b, 0], [1, -1]), [-1, 1]);
    parts.push(sumIntoTargets(tf.mul(m, cb), g));
  }
  const z = B === 1 ? parts[0]! : tf.concat(parts, 1);
  const out = tf.add(matMul(h, w0), matMul(z, tf.reshape(v, [B * dIn, dOut])));
  return { out: out as tf.Tensor2D, m, coefT, z };
}

/** The basis layer as one op with a hand-written gradient (see the formulation notes above). */
function basisLayerOp(g: GraphTensors) {
  return tf.customGrad((...args: (tf.Tensor | tf.GradSaveFunc)[]) => {
    const [h, w0, v, a, save] = args as [tf.Tensor, tf.Tensor, tf.Tensor, tf.Tensor, tf.GradSaveFunc];
    const f = basisForward(h as tf.Tensor2D, w0 as tf.Tensor2D, v as tf.Tensor3D, a as tf.Tensor2D, g);
    save([h, w0, v, f.m, f.coefT, f.z]);
    return {
      value: f.out,
      gradFunc: (dy: tf.Tensor2D, saved: tf.Tensor[]): tf.Tensor[] => {
        const [hs, w0s, vs, m, coefT, z] = saved as [tf.Tensor2D, tf.Tensor2D, tf.Tensor3D, tf.Tensor2D, tf.Tensor2D, tf.Tensor2D];
        const dOut = dy as tf.Tensor2D;
        const [B, dIn, dOutW] = vs.shape;
        const types = (a as tf.Tensor2D).shape[0];
        const vFlat = tf.reshape(vs, [B * dIn, dOutW]) as tf.Tensor2D;
        const dW0 = matMul(t2(hs), dOut);
        const dV = tf.reshape(matMul(t2(z), dOut), [B, dIn, dOutW]);
        let dH = matMul(dOut, t2(w0s));
        if (g.graph.pairCount === 0) return [dH, dW0, dV, tf.zeros([types, B])];
        const dZ = matMul(dOut, t2(vFlat));
        let dM: tf.Tensor2D | undefined;
        const dCoef: tf.Tensor1D[] = [];
        for (let b = 0; b < B; b++) {
          const dZb = B === 1 ? dZ : tf.slice(dZ, [0, b * dIn], [-1, dIn]);
          const dXb = tf.gatherND(dZb, g.pairTarget) as tf.Tensor2D;
          dCoef.push(tf.sum(tf.mul(dXb, m), 1));
          const cb = tf.reshape(tf.slice(coefT, [b, 0], [1, -1]), [-1, 1]);
          const term = tf.mul(dXb, cb) as tf.Tensor2D;
          dM = dM === undefined ? term : tf.add(dM, term);
        }
        dH = tf.add(dH, pairMeansGrad(dM!, g));
        // Stacking along rows then transposing is one contiguous copy; stacking columns is strided.
        const dC = tf.transpose(tf.stack(dCoef, 0)) as tf.Tensor2D;
        const dA = padRows(tf.sparse.sparseSegmentSum(dC, g.pairIndex, g.pairTypeFlat), types);
        return [dH, dW0, dV, dA];
      },
    };
  });
}

/**
 * The basis layer from tfjs ops with built-in gradients (gather, unsorted segment sums): the same
 * maths as {@link basisForward}, for the benchmark's comparison only.
 */
function builtinBasisForward(h: tf.Tensor2D, w0: tf.Tensor, v: tf.Tensor3D, a: tf.Tensor, g: GraphTensors): tf.Tensor2D {
  const [B, dIn, dOut] = v.shape;
  const N = g.graph.entityCount;
  const P = g.graph.pairCount;
  const m = tf.mul(tf.unsortedSegmentSum(tf.gather(h, g.edgeSrc), g.edgePair, P), g.pairScale);
  const coef = tf.gather(a, g.pairTypeFlat);
  const x = tf.reshape(tf.mul(tf.expandDims(m, 1), tf.expandDims(coef, 2)), [P, B * dIn]);
  const z = tf.unsortedSegmentSum(x, tf.reshape(g.pairTarget, [-1]) as tf.Tensor1D, N);
  return tf.add(tf.matMul(h, w0 as tf.Tensor2D), tf.matMul(z, tf.reshape(v, [B * dIn, dOut]) as tf.Tensor2D));
}

// ---- none / block: one matmul per relation type ----------------------------------------------------

/** Forward with dense W [T, d_in, d_out]: per type, the type's pair rows times W_r. */
function perTypeForward(h: tf.Tensor2D, w0: tf.Tensor2D, w: tf.Tensor3D, g: GraphTensors) {
  const m = pairMeans(h, g);
  const offsets = g.graph.typeOffsets;
  const ws = tf.unstack(w) as tf.Tensor2D[];
  const parts: tf.Tensor2D[] = [];
  for (let r = 0; r < g.graph.typeCount; r++) {
    const start = offsets[r]!;
    const n = offsets[r + 1]! - start;
    if (n > 0) parts.push(matMul(tf.slice(m, [start, 0], [n, -1]), ws[r]!));
  }
  const y = parts.length === 0 ? tf.zeros([0, w.shape[2]]) : parts.length === 1 ? parts[0]! : tf.concat(parts, 0);
  const out = tf.add(matMul(h, w0), sumIntoTargets(y as tf.Tensor2D, g)) as tf.Tensor2D;
  return { out, m };
}

function perTypeLayerOp(g: GraphTensors) {
  return tf.customGrad((...args: (tf.Tensor | tf.GradSaveFunc)[]) => {
    const [h, w0, w, save] = args as [tf.Tensor, tf.Tensor, tf.Tensor, tf.GradSaveFunc];
    const f = perTypeForward(h as tf.Tensor2D, w0 as tf.Tensor2D, w as tf.Tensor3D, g);
    save([h, w0, w, f.m]);
    return {
      value: f.out,
      gradFunc: (dy: tf.Tensor2D, saved: tf.Tensor[]): tf.Tensor[] => {
        const [hs, w0s, ws, m] = saved as [tf.Tensor2D, tf.Tensor2D, tf.Tensor3D, tf.Tensor2D];
        const dOut = dy as tf.Tensor2D;
        const [T, dIn, dOutW] = ws.shape;
        const dW0 = matMul(t2(hs), dOut);
        let dH = matMul(dOut, t2(w0s));
        if (g.graph.pairCount === 0) return [dH, dW0, tf.zeros([T, dIn, dOutW])];
        const dY = tf.gatherND(dOut, g.pairTarget) as tf.Tensor2D;
        const wT = tf.unstack(tf.transpose(ws, [0, 2, 1])) as tf.Tensor2D[];
        const offsets = g.graph.typeOffsets;
        const dWs: tf.Tensor2D[] = [];
        const dMs: tf.Tensor2D[] = [];
        for (let r = 0; r < T; r++) {
          const start = offsets[r]!;
          const n = offsets[r + 1]! - start;
          if (n === 0) {
            dWs.push(tf.zeros([dIn, dOutW]));
            continue;
          }
          const dYr = tf.slice(dY, [start, 0], [n, -1]);
          const mr = tf.slice(m, [start, 0], [n, -1]);
          dWs.push(matMul(t2(mr), dYr));
          dMs.push(matMul(dYr, wT[r]!));
        }
        const dM = dMs.length === 1 ? dMs[0]! : tf.concat(dMs, 0);
        dH = tf.add(dH, pairMeansGrad(dM, g));
        return [dH, dW0, tf.stack(dWs)];
      },
    };
  });
}

/** Dense W_r for every type from the layer's parameters (differentiable: built from tfjs ops). */
export function denseRelationWeights(shape: LayerShape, weights: LayerWeights): tf.Tensor3D {
  const { dIn, dOut, types, b } = shape;
  switch (shape.decomposition) {
    case 'none':
      return weights.w as unknown as tf.Tensor3D;
    case 'basis':
      // A copy, not a view: the wasm backend caches its packed right-hand matmul operand by buffer,
      // ignoring shape, and the aggregate formulation multiplies by V's buffer as [B·d_in, d_out].
      return tf.reshape(tf.matMul(weights.a!, tf.clone(tf.reshape(weights.w, [b, dIn * dOut]))), [types, dIn, dOut]);
    case 'block': {
      const ki = dIn / b;
      const ko = dOut / b;
      const rows: tf.Tensor3D[] = [];
      for (let k = 0; k < b; k++) {
        const q = tf.reshape(tf.slice(weights.w, [0, k, 0, 0], [types, 1, ki, ko]), [types, ki, ko]) as tf.Tensor3D;
        rows.push(tf.pad(q, [[0, 0], [0, 0], [k * ko, dOut - (k + 1) * ko]]));
      }
      return (b === 1 ? rows[0]! : tf.concat(rows, 1)) as tf.Tensor3D;
    }
  }
}

export type Formulation = 'aggregate' | 'per-type' | 'builtin';

/**
 * The layer's pre-activation output for input `h` over message graph `g`.
 * `training` selects the custom-gradient ops (their saved tensors are freed by the backward pass);
 * inference uses the same maths without them, so nothing is kept.
 * `formulation` defaults to `aggregate` for `basis` and `per-type` otherwise; `builtin` is the basis
 * maths from tfjs ops with their own gradients, kept for the benchmark.
 */
export function layerForward(
  shape: LayerShape,
  weights: LayerWeights,
  h: tf.Tensor2D,
  g: GraphTensors,
  training: boolean,
  formulation: Formulation = shape.decomposition === 'basis' ? 'aggregate' : 'per-type',
): tf.Tensor2D {
  if (formulation === 'aggregate') {
    if (shape.decomposition !== 'basis') throw new Error('the aggregate-first formulation needs the basis decomposition');
    const v = weights.w as unknown as tf.Tensor3D;
    if (training) return basisLayerOp(g)(h, weights.w0, v, weights.a!) as tf.Tensor2D;
    return tf.tidy(() => basisForward(h, weights.w0 as unknown as tf.Tensor2D, v, weights.a! as unknown as tf.Tensor2D, g).out);
  }
  if (formulation === 'builtin') {
    if (shape.decomposition !== 'basis') throw new Error('the built-in-gradient formulation is written for the basis decomposition');
    return tf.tidy(() => builtinBasisForward(h, weights.w0, weights.w as unknown as tf.Tensor3D, weights.a!, g));
  }
  const w = denseRelationWeights(shape, weights);
  if (training) return perTypeLayerOp(g)(h, weights.w0, w) as tf.Tensor2D;
  return tf.tidy(() => perTypeForward(h, weights.w0 as unknown as tf.Tensor2D, w, g).out);
}

/** Glorot-uniform initial weights (common practice), drawn from the seeded generator. */
export function initLayer(shape: LayerShape, random: Random, name: string): LayerWeights {
  const { dIn, dOut, types, b } = shape;
  const glorot = (n: number, fanIn: number, fanOut: number) => random.uniform(n, Math.sqrt(6 / (fanIn + fanOut)));
  const w0 = tf.variable(tf.tensor2d(glorot(dIn * dOut, dIn, dOut), [dIn, dOut]), true, `${name}/w0`);
  switch (shape.decomposition) {
    case 'none':
      return { w0, w: tf.variable(tf.tensor3d(glorot(types * dIn * dOut, dIn, dOut), [types, dIn, dOut]), true, `${name}/w`) };
    case 'basis':
      return {
        w0,
        w: tf.variable(tf.tensor3d(glorot(b * dIn * dOut, dIn, dOut), [b, dIn, dOut]), true, `${name}/v`),
        a: tf.variable(tf.tensor2d(glorot(types * b, types, b), [types, b]), true, `${name}/a`),
      };
    case 'block': {
      const ki = dIn / b;
      const ko = dOut / b;
      return { w0, w: tf.variable(tf.tensor4d(glorot(types * b * ki * ko, ki, ko), [types, b, ki, ko]), true, `${name}/q`) };
    }
  }
}

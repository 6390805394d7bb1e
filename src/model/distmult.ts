import { tf } from './backend.js';
import { countingOrder } from './edges.js';

/**
 * The DistMult decoder (Yang, Yih, He, Gao & Deng, "Embedding Entities and Relations for Learning
 * and Inference in Knowledge Bases", ICLR 2015), as used by Schlichtkrull et al. 2018 §4:
 *
 *     f(s, r, o) = Σ_k e_s[k] · R_r[k] · e_o[k]
 *
 * - e_s, e_o ∈ R^d: entity embeddings (the encoder's output, or a free table for plain DistMult);
 * - R_r ∈ R^d: the diagonal of relation r's matrix (one per predicate; the encoder's inverse types
 *   have no decoder vector).
 * f is a logit: σ(f) is the modelled probability that the triple holds. It is symmetric in s and o,
 * so ranking subjects of (?, r, o) is ranking objects of (o, r, ?).
 */

/** Row lookup with a gradient that sums rows back through a sorted index (no scatter needed). */
export function gatherRows(table: tf.Tensor2D, index: Int32Array): tf.Tensor2D {
  const rows = table.shape[0];
  const order = countingOrder(index.length, rows, (i) => index[i]!, null);
  const sorted = new Int32Array(index.length);
  for (let k = 0; k < index.length; k++) sorted[k] = index[order[k]!]!;
  const op = tf.customGrad((...args: (tf.Tensor | tf.GradSaveFunc)[]) => {
    const t = args[0] as tf.Tensor2D;
    const value = tf.gatherND(t, tf.tensor2d(index, [index.length, 1], 'int32')) as tf.Tensor2D;
    return {
      value,
      gradFunc: (dy: tf.Tensor2D) => {
        if (index.length === 0) return [tf.zerosLike(t)];
        const summed = tf.sparse.sparseSegmentSum(dy, tf.tensor1d(order, 'int32'), tf.tensor1d(sorted, 'int32')) as tf.Tensor2D;
        const n = summed.shape[0];
        return [n === rows ? summed : tf.pad(summed, [[0, rows - n], [0, 0]])];
      },
    };
  });
  return op(table) as tf.Tensor2D;
}

/**
 * One training step's triples: `batch` positives and, for each, `negatives` corruptions. Negative j
 * replaces one side of positive `anchor[j] mod batch` with entity `entity[j]`: the object when
 * anchor[j] < batch, else the subject.
 */
export interface ScoredBatch {
  s: Int32Array;
  r: Int32Array;
  o: Int32Array;
  entity: Int32Array;
  anchor: Int32Array;
}

/**
 * Mean binary cross-entropy with logits over positives (label 1) and negatives (label 0), plus
 * l2 · (mean e_s² + mean e_o² + mean R_r²) over the batch's positives: the L2 penalty on the
 * decoder's inputs of Schlichtkrull et al. 2018 §4 (their code penalises the mean square).
 */
export function batchLoss(h: tf.Tensor2D, relations: tf.Tensor2D, batch: ScoredBatch, l2: number): tf.Scalar {
  const b = batch.s.length;
  const n = batch.entity.length;
  const index = new Int32Array(2 * b + n);
  index.set(batch.s, 0);
  index.set(batch.o, b);
  index.set(batch.entity, 2 * b);
  const rows = gatherRows(h, index);
  const es = tf.slice(rows, [0, 0], [b, -1]);
  const eo = tf.slice(rows, [b, 0], [b, -1]);
  const rr = gatherRows(relations, batch.r);
  const queryObject = tf.mul(es, rr);
  const querySubject = tf.mul(eo, rr);
  const positive = tf.sum(tf.mul(queryObject, eo), 1);
  let loss = tf.sum(tf.softplus(tf.neg(positive)));
  if (n > 0) {
    const negativeRows = tf.slice(rows, [2 * b, 0], [n, -1]);
    const anchors = gatherRows(tf.concat([queryObject, querySubject], 0) as tf.Tensor2D, batch.anchor);
    const negative = tf.sum(tf.mul(anchors, negativeRows), 1);
    loss = tf.add(loss, tf.sum(tf.softplus(negative)));
  }
  loss = tf.div(loss, b + n);
  if (l2 > 0) loss = tf.add(loss, tf.mul(l2, tf.addN([tf.mean(tf.square(es)), tf.mean(tf.square(eo)), tf.mean(tf.square(rr))])));
  return loss as tf.Scalar;
}

const column = (x: Int32Array): tf.Tensor2D => tf.tensor2d(x, [x.length, 1], 'int32');

/** f(s, r, o) for each i. */
export function scoreTriples(h: tf.Tensor2D, relations: tf.Tensor2D, s: Int32Array, r: Int32Array, o: Int32Array): Float32Array {
  if (s.length === 0) return new Float32Array(0);
  return tf.tidy(() => {
    const es = tf.gatherND(h, column(s));
    const rr = tf.gatherND(relations, column(r));
    const eo = tf.gatherND(h, column(o));
    return tf.sum(tf.mul(tf.mul(es, rr), eo), 1);
  }).dataSync() as Float32Array;
}

/**
 * For each query i, f(anchor[i], r[i], e) for every entity e, row-major [queries × entities]:
 * (e_anchor ⊙ R_r) times the entity table transposed once beforehand (`hT`, [d, N]).
 */
export function scoreAll(h: tf.Tensor2D, hT: tf.Tensor2D, relations: tf.Tensor2D, anchor: Int32Array, r: Int32Array): Float32Array {
  if (anchor.length === 0) return new Float32Array(0);
  const out = tf.tidy(() => tf.matMul(tf.mul(tf.gatherND(h, column(anchor)), tf.gatherND(relations, column(r))) as tf.Tensor2D, hT));
  const values = out.dataSync() as Float32Array;
  out.dispose();
  return values;
}

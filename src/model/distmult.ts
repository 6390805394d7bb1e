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
 *
 * One custom-gradient op: with p = f(s, r, o) of the positives and n = f of the negatives,
 * ∂L/∂p = (σ(p) − 1)/m and ∂L/∂n = σ(n)/m (m = positives + negatives), and the chain rule through
 * the products is written out below. Rows go back to the tables through sorted-index segment sums,
 * so the op keeps no copies and needs no scatter.
 */
export function batchLoss(h: tf.Tensor2D, relations: tf.Tensor2D, batch: ScoredBatch, l2: number): tf.Scalar {
  const b = batch.s.length;
  const n = batch.entity.length;
  const d = h.shape[1];
  const m = b + n;
  const entityRows = new Int32Array(2 * b + n);
  entityRows.set(batch.s, 0);
  entityRows.set(batch.o, b);
  entityRows.set(batch.entity, 2 * b);
  const entitySum = sortedSum(entityRows, h.shape[0]);
  const relationSum = sortedSum(batch.r, relations.shape[0]);
  // Negatives are generated in positive order, so each side's anchors are already sorted.
  const objectSide: number[] = [];
  const subjectSide: number[] = [];
  for (let j = 0; j < n; j++) (batch.anchor[j]! < b ? objectSide : subjectSide).push(j);
  const column = (x: ArrayLike<number>): tf.Tensor2D => tf.tensor2d(Int32Array.from(x), [x.length, 1], 'int32');
  const op = tf.customGrad((...args: (tf.Tensor | tf.GradSaveFunc)[]) => {
    const [table, rel, save] = args as [tf.Tensor2D, tf.Tensor2D, tf.GradSaveFunc];
    const es = tf.gatherND(table, column(batch.s)) as tf.Tensor2D;
    const eo = tf.gatherND(table, column(batch.o)) as tf.Tensor2D;
    const rr = tf.gatherND(rel, column(batch.r)) as tf.Tensor2D;
    const queryObject = tf.mul(es, rr);
    const querySubject = tf.mul(eo, rr);
    const positive = tf.sum(tf.mul(queryObject, eo), 1);
    let loss = tf.sum(tf.softplus(tf.neg(positive)));
    let en: tf.Tensor2D | undefined;
    let query: tf.Tensor2D | undefined;
    let negative: tf.Tensor1D | undefined;
    if (n > 0) {
      en = tf.gatherND(table, column(batch.entity)) as tf.Tensor2D;
      query = tf.gatherND(tf.concat([queryObject, querySubject], 0), column(batch.anchor)) as tf.Tensor2D;
      negative = tf.sum(tf.mul(query, en), 1);
      loss = tf.add(loss, tf.sum(tf.softplus(negative)));
    }
    loss = tf.div(loss, m);
    if (l2 > 0) loss = tf.add(loss, tf.mul(l2 / (b * d), tf.addN([tf.sum(tf.square(es)), tf.sum(tf.square(eo)), tf.sum(tf.square(rr))])));
    save(n > 0 ? [es, eo, rr, positive, en!, query!, negative!] : [es, eo, rr, positive]);
    return {
      value: loss as tf.Scalar,
      gradFunc: (dy: tf.Scalar, saved: tf.Tensor[]) => {
        const [ses, seo, srr, spos, sen, squery, sneg] = saved as [tf.Tensor2D, tf.Tensor2D, tf.Tensor2D, tf.Tensor1D, tf.Tensor2D?, tf.Tensor2D?, tf.Tensor1D?];
        const gp = tf.reshape(tf.mul(tf.sub(tf.sigmoid(spos), 1), tf.div(dy, m)), [b, 1]);
        const c = tf.mul(dy, (2 * l2) / (b * d));
        let dEs: tf.Tensor2D = tf.add(tf.mul(gp, tf.mul(srr, seo)), tf.mul(c, ses));
        let dEo: tf.Tensor2D = tf.add(tf.mul(gp, tf.mul(srr, ses)), tf.mul(c, seo));
        let dRr: tf.Tensor2D = tf.add(tf.mul(gp, tf.mul(ses, seo)), tf.mul(c, srr));
        const parts: tf.Tensor2D[] = [];
        if (n > 0) {
          const gn = tf.reshape(tf.mul(tf.sigmoid(sneg!), tf.div(dy, m)), [n, 1]);
          const dQuery = tf.mul(gn, sen!);
          parts.push(tf.mul(gn, squery!));
          const back = (side: number[]): tf.Tensor2D => {
            if (side.length === 0) return tf.zeros([b, d]);
            const seg = Int32Array.from(side, (j) => batch.anchor[j]! % b);
            const summed = tf.sparse.sparseSegmentSum(dQuery, Int32Array.from(side), seg) as tf.Tensor2D;
            return padTo(summed, b);
          };
          const dA = back(objectSide);
          const dB = back(subjectSide);
          dEs = tf.add(dEs, tf.mul(dA, srr));
          dEo = tf.add(dEo, tf.mul(dB, srr));
          dRr = tf.add(dRr, tf.add(tf.mul(dA, ses), tf.mul(dB, seo)));
        }
        const rows = tf.concat([dEs, dEo, ...parts], 0) as tf.Tensor2D;
        return [entitySum(rows), relationSum(dRr)];
      },
    };
  });
  return op(h, relations) as tf.Scalar;
}

/** Σ of gradient rows into a table of `rows` rows, by a sorted index computed once in JS. */
function sortedSum(index: Int32Array, rows: number): (dy: tf.Tensor2D) => tf.Tensor2D {
  const order = countingOrder(index.length, rows, (i) => index[i]!, null);
  const sorted = new Int32Array(index.length);
  for (let k = 0; k < index.length; k++) sorted[k] = index[order[k]!]!;
  return (dy) => {
    if (index.length === 0) return tf.zeros([rows, dy.shape[1]]);
    return padTo(tf.sparse.sparseSegmentSum(dy, order, sorted) as tf.Tensor2D, rows);
  };
}

function padTo(x: tf.Tensor2D, rows: number): tf.Tensor2D {
  const n = x.shape[0];
  return n === rows ? x : tf.pad(x, [[0, rows - n], [0, 0]]);
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

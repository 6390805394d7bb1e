import type { TermDictionary } from '../graph/terms.js';
import { rethrowMemory, tf } from './backend.js';
import { scoreAll, scoreTriples } from './distmult.js';
import { weightList, type Weights } from './encoder.js';
import type { BackendName, EntityIndex, HistoryEntry, ModelConfig, RelationIndex, TrainedModel } from './types.js';

/** What a checkpoint records about the graph the final embeddings were computed on. */
export interface Fingerprint {
  /** Entity term keys, in index order. */
  entities: string;
  /** Relation term keys, in index order. */
  relations: string;
  /** The message-passing triples (order-independent). */
  edges: string;
}

/**
 * A fitted (or loaded) model: its weights, and the final entity embeddings the decoder scores with,
 * computed once by the encoder over the graph minus the hidden triples.
 */
export class RelationalModel implements TrainedModel {
  private transposed: tf.Tensor2D | undefined;
  private disposed = false;

  constructor(
    readonly config: ModelConfig,
    readonly backend: BackendName,
    readonly entities: EntityIndex,
    readonly relations: RelationIndex,
    readonly history: HistoryEntry[],
    readonly weights: Weights,
    /** [entities, dim]: the decoder's entity embeddings. */
    readonly embeddings: tf.Tensor2D,
    readonly fingerprint: Fingerprint,
    /** The entity term keys, in index order (for checkpoints and warm starts). */
    readonly entityKeys: readonly string[],
    readonly unseenEntities = 0,
    /** Set when loaded without a graph: the dictionary the entity and relation indexes refer to. */
    readonly dictionary?: TermDictionary,
    /** Set when loaded against a graph: 1 for entities the saved model did not know. */
    readonly unseen?: Uint8Array,
  ) {}

  private check(s: Int32Array, r: Int32Array | null, o: Int32Array | null): void {
    if (this.disposed) throw new Error('the model has been disposed');
    const n = s.length;
    for (const [name, array, limit] of [
      ['subject', s, this.entities.count],
      ['relation', r, this.relations.count],
      ['object', o, this.entities.count],
    ] as const) {
      if (array === null) continue;
      if (array.length !== n) throw new RangeError(`score: ${name} indexes have length ${array.length}, expected ${n}`);
      for (let i = 0; i < array.length; i++) {
        const v = array[i]!;
        if (v < 0 || v >= limit || !Number.isInteger(v)) throw new RangeError(`score: ${name} index ${v} at ${i} is outside 0..${limit - 1}`);
      }
    }
  }

  async score(s: Int32Array, r: Int32Array, o: Int32Array): Promise<Float32Array> {
    this.check(s, r, o);
    try {
      return scoreTriples(this.embeddings, this.weights.relations, s, r, o);
    } catch (error) {
      rethrowMemory(error, 'scoring triples');
    }
  }

  /** The entity table transposed once, [dim, entities], for ranking matmuls. */
  private entityColumns(): tf.Tensor2D {
    this.transposed ??= tf.transpose(this.embeddings);
    return this.transposed;
  }

  async scoreObjects(s: Int32Array, r: Int32Array): Promise<Float32Array> {
    this.check(s, r, null);
    try {
      return scoreAll(this.embeddings, this.entityColumns(), this.weights.relations, s, r);
    } catch (error) {
      rethrowMemory(error, 'ranking candidates');
    }
  }

  async scoreSubjects(r: Int32Array, o: Int32Array): Promise<Float32Array> {
    this.check(o, r, null);
    // DistMult is symmetric: f(e, r, o) = f(o, r, e).
    try {
      return scoreAll(this.embeddings, this.entityColumns(), this.weights.relations, o, r);
    } catch (error) {
      rethrowMemory(error, 'ranking candidates');
    }
  }

  async save(dir: string): Promise<void> {
    const { saveModel } = await import('./checkpoint.js');
    await saveModel(this, dir);
  }

  dispose(): void {
    if (this.disposed) return;
    this.disposed = true;
    for (const v of weightList(this.weights)) v.dispose();
    this.embeddings.dispose();
    this.transposed?.dispose();
  }
}

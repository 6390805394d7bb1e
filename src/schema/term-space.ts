import type { Graph } from '../graph/store.js';

/**
 * One id space for the data graph's terms and the schema's: ids below `graph.terms.size` are the
 * data graph's own term ids, so checks index schema tables with `graph.p[t]` directly; terms that
 * only the schema or shapes name get ids above. Schema graphs have their own dictionaries, so they
 * are mapped in by key.
 */
export class TermSpace {
  private readonly extra = new Map<string, number>();
  private readonly extraKeys: string[] = [];
  readonly dataSize: number;

  constructor(readonly graph: Graph) {
    this.dataSize = graph.terms.size;
  }

  /** The id of `key`, giving it a schema-only id when the data graph does not hold it. */
  intern(key: string): number {
    const id = this.graph.terms.id(key);
    if (id >= 0) return id;
    let e = this.extra.get(key);
    if (e === undefined) {
      e = this.dataSize + this.extraKeys.length;
      this.extra.set(key, e);
      this.extraKeys.push(key);
    }
    return e;
  }

  /** The id of `key`, or -1 when neither the data nor the schema names it. */
  id(key: string): number {
    const id = this.graph.terms.id(key);
    return id >= 0 ? id : (this.extra.get(key) ?? -1);
  }

  key(id: number): string {
    if (id < this.dataSize) return this.graph.terms.key(id);
    const k = this.extraKeys[id - this.dataSize];
    if (k === undefined) throw new RangeError(`term id ${id} is not in the schema's term space`);
    return k;
  }

  get size(): number {
    return this.dataSize + this.extraKeys.length;
  }
}

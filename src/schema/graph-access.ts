import type { SourceLocation } from '../findings.js';
import { row, type Graph } from '../graph/store.js';
import { V } from './vocab.js';

/** Reading helpers over a {@link Graph} by term keys, for schema and shapes graphs whose dictionary is not the data graph's. */

/** Where triple `t` was read, or undefined when the graph has no line for it. */
export function sourceOf(graph: Graph, t: number): SourceLocation | undefined {
  const file = graph.provenance.files[graph.provenance.file[t] ?? -1];
  const line = graph.provenance.line[t];
  if (file === undefined || line === undefined || line === 0) return undefined;
  return { file, line };
}

/** The triples of `graph` with predicate `predicate` (by key), as [subject key, object key, triple]. */
export function* triplesWith(graph: Graph, predicate: string): Generator<[string, string, number]> {
  const p = graph.terms.id(predicate);
  if (p < 0) return;
  const keys = graph.terms.allKeys();
  for (const t of row(graph.byPredicate, p)) yield [keys[graph.s[t]!]!, keys[graph.o[t]!]!, t];
}

/** The subjects typed `cls` (by key) in `graph`, with the typing triple. */
export function* instancesOf(graph: Graph, cls: string): Generator<[string, number]> {
  const c = graph.terms.id(cls);
  const type = graph.terms.id(V.type);
  if (c < 0 || type < 0) return;
  const keys = graph.terms.allKeys();
  for (const t of row(graph.byObject, c)) if (graph.p[t] === type) yield [keys[graph.s[t]!]!, t];
}

/** The objects of (`subject`, `predicate`) by key, with their triples. */
export function objectsOf(graph: Graph, subject: string, predicate: string): Array<[string, number]> {
  const s = graph.terms.id(subject);
  const p = graph.terms.id(predicate);
  if (s < 0 || p < 0) return [];
  const keys = graph.terms.allKeys();
  const out: Array<[string, number]> = [];
  for (const t of row(graph.bySubject, s)) if (graph.p[t] === p) out.push([keys[graph.o[t]!]!, t]);
  return out;
}

/** Every triple of `subject` by key, as [predicate key, object key, triple]. */
export function propertiesOf(graph: Graph, subject: string): Array<[string, string, number]> {
  const s = graph.terms.id(subject);
  if (s < 0) return [];
  const keys = graph.terms.allKeys();
  const out: Array<[string, string, number]> = [];
  for (const t of row(graph.bySubject, s)) out.push([keys[graph.p[t]!]!, keys[graph.o[t]!]!, t]);
  return out;
}

export type ListResult = { items: Array<[string, number]> } | { error: string; triple: number | undefined };

/**
 * Reads an RDF collection (rdf:first / rdf:rest) from `head`. A cell without exactly one rdf:first
 * and one rdf:rest, or a list that loops back on itself, is an error rather than a hang.
 */
export function readList(graph: Graph, head: string, at?: number): ListResult {
  const items: Array<[string, number]> = [];
  const seen = new Set<string>();
  let cell = head;
  while (cell !== V.nil) {
    if (seen.has(cell)) return { error: 'the list loops back on itself', triple: at };
    seen.add(cell);
    const first = objectsOf(graph, cell, V.first);
    const rest = objectsOf(graph, cell, V.rest);
    if (first.length !== 1 || rest.length !== 1) {
      return { error: `${cell} is not a well-formed RDF list cell (needs one rdf:first and one rdf:rest)`, triple: first[0]?.[1] ?? rest[0]?.[1] ?? at };
    }
    items.push(first[0]!);
    cell = rest[0]![0];
  }
  return { items };
}

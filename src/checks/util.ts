import { row, type Graph } from '../graph/store.js';
import { RDF_LANG_STRING, XSD_STRING } from '../graph/terms.js';
import type { Schema } from '../schema/index.js';
import { isSchemaVocabulary, shortName } from '../schema/vocab.js';

/** The datatype IRI of a literal key, read from its tail without unescaping the lexical form. */
export function datatypeOfKey(key: string): string {
  if (key.endsWith('>')) return key.slice(key.lastIndexOf('"^^<') + 4, -1);
  return key.charCodeAt(key.length - 1) === 34 ? XSD_STRING : RDF_LANG_STRING;
}

export function isLiteralKey(key: string): boolean {
  return key.charCodeAt(0) === 34;
}

/** Annotation properties of RDFS that describe data, kept although they live in the RDFS namespace. */
const ANNOTATIONS = new Set(['label', 'comment', 'seeAlso', 'isDefinedBy'].map((l) => `http://www.w3.org/2000/01/rdf-schema#${l}`));

/**
 * The predicates of the data graph, in id order, without those of the RDF, RDFS, OWL and SHACL
 * vocabularies (the graph's own schema statements: an ontology given with --schema may declare
 * domains for rdfs:domain itself, which would flag every axiom) but with RDFS's annotation properties.
 */
export function* dataPredicates(graph: Graph): Generator<number> {
  const offsets = graph.byPredicate.offsets;
  const keys = graph.terms.allKeys();
  for (let p = 0; p + 1 < offsets.length; p++) {
    if (offsets[p + 1]! === offsets[p]!) continue;
    const key = keys[p]!;
    if (isSchemaVocabulary(key) && !ANNOTATIONS.has(key)) continue;
    yield p;
  }
}

/** Term keys of term-space ids, for evidence. */
export function keysOf(schema: Schema, ids: Iterable<number>): string[] {
  return [...ids].map((id) => schema.key(id));
}

/** Short names joined for a message: `ex:A, ex:B`. */
export function names(keys: readonly string[], max = 4): string {
  const shown = keys.slice(0, max).map(shortName).join(', ');
  return keys.length > max ? `${shown} and ${keys.length - max} more` : shown;
}

/** `file:line` of a location, for evidence. */
export function at(source: { file: string; line: number } | undefined): string | undefined {
  return source ? `${source.file}:${source.line}` : undefined;
}

/** The first triple that mentions `term`, as subject if it has one, else as object; -1 when none. */
export function firstTripleOf(graph: Graph, term: number): number {
  if (term < 0) return -1;
  const out = row(graph.bySubject, term);
  if (out.length > 0) return out[0]!;
  const into = row(graph.byObject, term);
  return into.length > 0 ? into[0]! : -1;
}

/** Drops undefined entries so evidence stays JSON-clean under exactOptionalPropertyTypes. */
export function compact(record: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(record)) if (v !== undefined) out[k] = v;
  return out;
}

/** Each literal term's datatype as a small index into `names`; -1 for IRIs and blank nodes. Built once per graph. */
export interface LiteralDatatypes {
  of: Int32Array;
  names: string[];
}

const datatypeCache = new WeakMap<Graph, LiteralDatatypes>();

export function literalDatatypes(graph: Graph): LiteralDatatypes {
  let cached = datatypeCache.get(graph);
  if (!cached) {
    const keys = graph.terms.allKeys();
    const of = new Int32Array(graph.terms.size).fill(-1);
    const names: string[] = [];
    const index = new Map<string, number>();
    for (let t = 0; t < keys.length; t++) {
      const key = keys[t]!;
      if (key.charCodeAt(0) !== 34) continue;
      const dt = datatypeOfKey(key);
      let i = index.get(dt);
      if (i === undefined) {
        i = names.length;
        index.set(dt, i);
        names.push(dt);
      }
      of[t] = i;
    }
    cached = { of, names };
    datatypeCache.set(graph, cached);
  }
  return cached;
}

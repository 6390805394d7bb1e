import { GraphBuilder, row, type Graph } from '../graph/store.js';
import { TermKind, literalKey, literalParts, termKind, toNTriples } from '../graph/terms.js';
import { PlumbError } from '../errors.js';

/**
 * Error injection for measuring the auditor: errors are *added* to a copy of the graph (the original
 * triples stay), so a detector is scored on finding planted triples among true ones.
 *
 * - `random`: the subject or the object is replaced by an entity drawn uniformly from all entities;
 * - `range`: the replacement is drawn from the entities already seen in that position of that predicate
 *   (type-plausible errors, the hard case);
 * - `predicate`: the predicate is replaced by another predicate of the graph, drawn uniformly.
 *
 * For `random` and `range`, half the errors replace the subject and half the object. No injected
 * triple repeats a triple of the graph (in any named graph) or another injected triple.
 */
export type CorruptionKind = 'random' | 'range' | 'predicate';
export const CORRUPTION_KINDS: readonly CorruptionKind[] = ['random', 'range', 'predicate'];
export type ReplacedPosition = 'subject' | 'predicate' | 'object';

export interface CorruptOptions {
  /** Errors to add, as a share of the graph's triples (0.05 = 5%). */
  rate: number;
  /** The kinds to inject; the errors are shared out evenly among them. */
  kinds: readonly CorruptionKind[];
  seed?: number;
  /**
   * Triples that may serve as originals (1 = may). Default: triples whose subject and object are
   * resources (IRIs or blank nodes), the triples a model can score.
   */
  eligible?: Uint8Array;
}

export interface InjectedTriple {
  s: number;
  p: number;
  o: number;
  /** Named graph of the original triple (-1: default graph). */
  g: number;
  kind: CorruptionKind;
  replaced: ReplacedPosition;
  /** Term id that stood in the replaced position. */
  original: number;
  /** Index of the original triple in the source graph. */
  source: number;
}

export interface Corruption {
  /** The source graph's triples at the same indexes, then the injected ones from `firstInjected` on. */
  graph: Graph;
  injected: InjectedTriple[];
  firstInjected: number;
}

/** Mulberry32: a small seeded PRNG (common practice); returns floats in [0, 1). */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** True when (s, p, o) is a triple of the graph, in any named graph. */
export function hasTriple(graph: Graph, s: number, p: number, o: number): boolean {
  const ts = row(graph.bySubject, s);
  const to = row(graph.byObject, o);
  // Scan the shorter of the two rows.
  if (ts.length <= to.length) {
    for (const t of ts) if (graph.p[t] === p && graph.o[t] === o) return true;
  } else {
    for (const t of to) if (graph.p[t] === p && graph.s[t] === s) return true;
  }
  return false;
}

/** Triples whose subject and object are resources: the ones a model can score. */
export function resourceTriples(graph: Graph): Uint8Array {
  const out = new Uint8Array(graph.size);
  const isResource = new Uint8Array(graph.terms.size);
  const keys = graph.terms.allKeys();
  for (let t = 0; t < keys.length; t++) isResource[t] = termKind(keys[t]!) === TermKind.Literal ? 0 : 1;
  for (let i = 0; i < graph.size; i++) out[i] = isResource[graph.s[i]!]! & isResource[graph.o[i]!]!;
  return out;
}

/** Distinct values of a column over a list of triples. */
function distinct(column: Int32Array, triples: Int32Array): Int32Array {
  const seen = new Set<number>();
  for (const t of triples) seen.add(column[t]!);
  return Int32Array.from(seen);
}

/** Shares `total` out among `parts` as evenly as possible, the remainder going to the first ones. */
function shareOut(total: number, parts: number): number[] {
  return Array.from({ length: parts }, (_, i) => Math.floor(total / parts) + (i < total % parts ? 1 : 0));
}

/**
 * Adds `round(rate · size)` errors to a copy of the graph. Throws a PlumbError when the graph is too
 * small or too uniform to hold that many distinct new triples.
 */
export function corruptGraph(graph: Graph, options: CorruptOptions): Corruption {
  const { rate, kinds } = options;
  if (!(rate > 0 && rate <= 1)) throw new PlumbError('E_USAGE', `--rate must be in (0, 1], got ${rate}`, { hint: 'use e.g. --rate 0.05 for 5%' });
  if (kinds.length === 0) throw new PlumbError('E_USAGE', 'no error kind given', { hint: `use --kind ${CORRUPTION_KINDS.join('|')}` });
  const random = seededRandom(options.seed ?? 1);
  const pick = <T extends ArrayLike<number>>(xs: T): number => xs[Math.floor(random() * xs.length)]!;
  const eligible = options.eligible ?? resourceTriples(graph);

  // Originals: a shuffled list of eligible triples, each used at most once.
  const pool: number[] = [];
  for (let i = 0; i < graph.size; i++) if (eligible[i]) pool.push(i);
  for (let i = pool.length - 1; i > 0; i--) {
    const j = Math.floor(random() * (i + 1));
    [pool[i], pool[j]] = [pool[j]!, pool[i]!];
  }

  // Entities: resources seen as subject or object of an eligible triple; predicates likewise.
  const entitySet = new Set<number>();
  const predicateSet = new Set<number>();
  for (const t of pool) {
    entitySet.add(graph.s[t]!);
    entitySet.add(graph.o[t]!);
    predicateSet.add(graph.p[t]!);
  }
  const entities = Int32Array.from([...entitySet].sort((a, b) => a - b));
  const predicates = Int32Array.from([...predicateSet].sort((a, b) => a - b));
  const rangeCache = new Map<string, Int32Array>();
  const rangeOf = (p: number, position: 'subject' | 'object'): Int32Array => {
    const key = `${position}:${p}`;
    let values = rangeCache.get(key);
    if (values === undefined) {
      const triples = row(graph.byPredicate, p).filter((t) => eligible[t] === 1);
      values = distinct(position === 'subject' ? graph.s : graph.o, triples).sort();
      rangeCache.set(key, values);
    }
    return values;
  };

  const total = Math.round(rate * graph.size);
  const perKind = shareOut(total, kinds.length);
  const made = new Set<string>();
  const injected: InjectedTriple[] = [];
  let cursor = 0;
  kinds.forEach((kind, k) => {
    const want = perKind[k]!;
    // Half subject, half object (the odd one, if any, replaces the object).
    const positions: ReplacedPosition[] =
      kind === 'predicate' ? Array(want).fill('predicate') : [...Array(Math.floor(want / 2)).fill('subject'), ...Array(want - Math.floor(want / 2)).fill('object')];
    for (const replaced of positions) {
      let done = false;
      while (!done) {
        if (cursor >= pool.length) {
          throw new PlumbError('E_INPUT', `could not inject ${total} distinct errors of kind ${kinds.join(', ')}: the graph has too few eligible triples or too little variety`, {
            hint: 'use a lower --rate, or another --kind',
          });
        }
        const t = pool[cursor++]!;
        const s = graph.s[t]!, p = graph.p[t]!, o = graph.o[t]!;
        const choices =
          replaced === 'predicate' ? predicates : kind === 'random' ? entities : rangeOf(p, replaced === 'subject' ? 'subject' : 'object');
        const original = replaced === 'subject' ? s : replaced === 'object' ? o : p;
        if (choices.length < 2) continue;
        // A few draws per original; an original with no fresh replacement is skipped.
        for (let attempt = 0; attempt < 20 && !done; attempt++) {
          const r = pick(choices);
          if (r === original) continue;
          const ns = replaced === 'subject' ? r : s, np = replaced === 'predicate' ? r : p, no = replaced === 'object' ? r : o;
          const key = `${ns} ${np} ${no}`;
          if (made.has(key) || hasTriple(graph, ns, np, no)) continue;
          made.add(key);
          injected.push({ s: ns, p: np, o: no, g: graph.g[t]!, kind, replaced, original, source: t });
          done = true;
        }
      }
    }
  });

  const builder = new GraphBuilder(graph.terms);
  const files = graph.provenance.files.map((f) => builder.addFile(f));
  for (let i = 0; i < graph.size; i++) {
    builder.add(graph.s[i]!, graph.p[i]!, graph.o[i]!, graph.g[i]!, files[graph.provenance.file[i]!] ?? 0, graph.provenance.line[i]!);
  }
  const plantedFile = builder.addFile('(injected)');
  injected.forEach((e, i) => builder.add(e.s, e.p, e.o, e.g, plantedFile, i + 1));
  return { graph: builder.build(), injected, firstInjected: graph.size };
}

/** A term in N-Triples form that is safe inside a tab-separated field (a literal's tabs escaped). */
export function termToField(key: string): string {
  if (termKind(key) !== TermKind.Literal) return toNTriples(key);
  return key.includes('\t') ? key.replace(/\t/g, '\\t') : key;
}

/** The term key of a field written by {@link termToField} (or any N-Triples term). */
export function fieldToTerm(field: string): string {
  const f = field.trim();
  if (f.startsWith('<') && f.endsWith('>')) return f.slice(1, -1);
  if (f.startsWith('"')) {
    const { lexical, datatype, language } = literalParts(f);
    return literalKey(lexical, datatype, language);
  }
  return f;
}

export const TRUTH_HEADER = ['subject', 'predicate', 'object', 'graph', 'kind', 'replaced', 'original'] as const;

/**
 * The truth file: a tab-separated table with a header row, one injected triple per line. Terms are in
 * N-Triples form (`<iri>`, `_:label`, `"literal"`); `graph` is empty for the default graph;
 * `replaced` names the position that was changed and `original` the term that stood there.
 */
export function truthText(graph: Graph, injected: readonly InjectedTriple[]): string {
  const key = (id: number): string => termToField(graph.terms.key(id));
  const lines = [TRUTH_HEADER.join('\t')];
  for (const e of injected) {
    lines.push([key(e.s), key(e.p), key(e.o), e.g < 0 ? '' : key(e.g), e.kind, e.replaced, key(e.original)].join('\t'));
  }
  return `${lines.join('\n')}\n`;
}

export interface TruthEntry {
  subject: string;
  predicate: string;
  object: string;
  graph?: string;
  kind: string;
  replaced?: string;
  original?: string;
}

/** Parses a truth file (see {@link truthText}); `file` names it in error messages. */
export function parseTruth(text: string, file: string): TruthEntry[] {
  const out: TruthEntry[] = [];
  const lines = text.split(/\r?\n/);
  lines.forEach((line, i) => {
    if (line.trim() === '' || line.startsWith('#')) return;
    const cells = line.split('\t');
    if (i === 0 && cells[0] === 'subject') return;
    if (cells.length < 3) {
      throw new PlumbError('E_PARSE', `expected at least 3 tab-separated columns (subject, predicate, object), found ${cells.length}`, {
        position: { file, line: i + 1 },
        hint: 'a truth file is written by `plumb corrupt --truth`; its columns are subject, predicate, object, graph, kind, replaced, original',
      });
    }
    const entry: TruthEntry = { subject: fieldToTerm(cells[0]!), predicate: fieldToTerm(cells[1]!), object: fieldToTerm(cells[2]!), kind: cells[4]?.trim() || 'error' };
    if (cells[3]?.trim()) entry.graph = fieldToTerm(cells[3]);
    if (cells[5]?.trim()) entry.replaced = cells[5].trim();
    if (cells[6]?.trim()) entry.original = fieldToTerm(cells[6]);
    out.push(entry);
  });
  return out;
}

/** `true` when the graph holds a named graph anywhere. */
export function hasNamedGraphs(graph: Graph): boolean {
  for (let i = 0; i < graph.size; i++) if (graph.g[i]! >= 0) return true;
  return false;
}

/** Writes the graph's triples as N-Triples (or N-Quads where a triple sits in a named graph), one per line. */
export function* nQuadsLines(graph: Graph): Generator<string> {
  const key = (id: number): string => toNTriples(graph.terms.key(id));
  for (let i = 0; i < graph.size; i++) {
    const g = graph.g[i]!;
    yield g < 0 ? `${key(graph.s[i]!)} ${key(graph.p[i]!)} ${key(graph.o[i]!)} .\n` : `${key(graph.s[i]!)} ${key(graph.p[i]!)} ${key(graph.o[i]!)} ${key(g)} .\n`;
  }
}

const TSV_BARE = /^[^\s<>"{}|\\^`#][^\s<>"{}|\\^`]*$/;
const TSV_ABSOLUTE = /^[A-Za-z][A-Za-z0-9+.-]*:/;

/**
 * A term as a TSV cell that plumb's TSV reader turns back into the same term: an IRI under `baseIri`
 * with a bare local part is written bare (as the open datasets are), any other IRI in angle
 * brackets, a literal in N-Triples form with its tabs escaped, a blank node as `_:label`.
 */
export function tsvCell(key: string, baseIri: string): string {
  if (termKind(key) === TermKind.Iri && key.startsWith(baseIri)) {
    const local = key.slice(baseIri.length);
    if (TSV_BARE.test(local) && !TSV_ABSOLUTE.test(local) && !local.startsWith('_:')) return local;
  }
  return termToField(key);
}

/** The graph's triples as TSV rows (subject, predicate, object[, graph]). */
export function* tsvLines(graph: Graph, baseIri: string): Generator<string> {
  const cell = (id: number): string => tsvCell(graph.terms.key(id), baseIri);
  for (let i = 0; i < graph.size; i++) {
    const g = graph.g[i]!;
    yield g < 0 ? `${cell(graph.s[i]!)}\t${cell(graph.p[i]!)}\t${cell(graph.o[i]!)}\n` : `${cell(graph.s[i]!)}\t${cell(graph.p[i]!)}\t${cell(graph.o[i]!)}\t${cell(g)}\n`;
  }
}

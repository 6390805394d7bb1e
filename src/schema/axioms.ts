import type { SourceLocation } from '../findings.js';
import type { Graph } from '../graph/store.js';
import { termKind, TermKind } from '../graph/terms.js';
import { instancesOf, objectsOf, readList, sourceOf, triplesWith } from './graph-access.js';
import type { SchemaIssue } from './issues.js';
import type { TermSpace } from './term-space.js';
import { V } from './vocab.js';

/** An axiom as read: two term ids and where it was declared. */
export interface Axiom {
  a: number;
  b: number;
  source: SourceLocation | undefined;
}

/** Property characteristics plumb checks, from `rdf:type owl:…Property` declarations. */
export type Characteristic = 'functional' | 'inverseFunctional' | 'irreflexive' | 'asymmetric' | 'objectProperty' | 'datatypeProperty' | 'datatype';

const CHARACTERISTIC_CLASSES: ReadonlyArray<readonly [Characteristic, string]> = [
  ['functional', V.functionalProperty],
  ['inverseFunctional', V.inverseFunctionalProperty],
  ['irreflexive', V.irreflexiveProperty],
  ['asymmetric', V.asymmetricProperty],
  ['objectProperty', V.objectProperty],
  ['datatypeProperty', V.datatypeProperty],
  ['datatype', V.rdfsDatatype],
];

/**
 * The RDFS and OWL 2 axioms plumb reads, with ids in one {@link TermSpace}. `subClassOf` and
 * `subPropertyOf` also hold the two directions of `owl:equivalentClass` / `owl:equivalentProperty`
 * (OWL 2 Direct Semantics: equivalence is mutual subsumption), marked in `equivalent`.
 */
export interface Axioms {
  domain: Axiom[];
  range: Axiom[];
  subClassOf: Axiom[];
  subPropertyOf: Axiom[];
  /** `a owl:disjointWith b`, and each pair of an `owl:AllDisjointClasses` member list. */
  disjointWith: Axiom[];
  /** Edge keys `a b` that came from an equivalence axiom, so cycles they form are not reported. */
  equivalent: Set<string>;
  characteristics: Map<Characteristic, Map<number, SourceLocation | undefined>>;
}

export function emptyAxioms(): Axioms {
  return {
    domain: [],
    range: [],
    subClassOf: [],
    subPropertyOf: [],
    disjointWith: [],
    equivalent: new Set(),
    characteristics: new Map(CHARACTERISTIC_CLASSES.map(([c]) => [c, new Map()])),
  };
}

/**
 * Adds the axioms `graph` states to `axioms`. Only the triples of the axiom predicates and classes
 * are visited (through the graph's indexes), so reading the audited graph's own schema is cheap.
 */
export function collectAxioms(graph: Graph, space: TermSpace, axioms: Axioms, issues: SchemaIssue[]): void {
  const pair = (list: Axiom[], predicate: string, requireIris: boolean): void => {
    for (const [s, o, t] of triplesWith(graph, predicate)) {
      if (requireIris && (termKind(s) === TermKind.Literal || termKind(o) === TermKind.Literal)) {
        issues.push({
          severity: 'error',
          code: 'malformed-axiom',
          message: `${predicate.split('#')[1] ?? predicate} needs a class or property on both sides, not a literal`,
          subject: s,
          predicate,
          object: o,
          ...withSource(sourceOf(graph, t)),
        });
        continue;
      }
      list.push({ a: space.intern(s), b: space.intern(o), source: sourceOf(graph, t) });
    }
  };
  pair(axioms.domain, V.domain, true);
  pair(axioms.range, V.range, true);
  pair(axioms.subClassOf, V.subClassOf, true);
  pair(axioms.subPropertyOf, V.subPropertyOf, true);
  pair(axioms.disjointWith, V.disjointWith, true);

  const equivalence = (list: Axiom[], predicate: string): void => {
    const found: Axiom[] = [];
    pair(found, predicate, true);
    for (const ax of found) {
      list.push(ax, { a: ax.b, b: ax.a, source: ax.source });
      axioms.equivalent.add(`${ax.a} ${ax.b}`).add(`${ax.b} ${ax.a}`);
    }
  };
  equivalence(axioms.subClassOf, V.equivalentClass);
  equivalence(axioms.subPropertyOf, V.equivalentProperty);

  for (const [characteristic, cls] of CHARACTERISTIC_CLASSES) {
    const into = axioms.characteristics.get(characteristic)!;
    for (const [s, t] of instancesOf(graph, cls)) {
      const id = space.intern(s);
      if (!into.has(id)) into.set(id, sourceOf(graph, t));
    }
  }

  // OWL 2 Structural Specification §9.1.3: AllDisjointClasses(C1 … Cn), mapped to RDF (OWL 2 Mapping
  // to RDF Graphs, Table 1) as `_:x rdf:type owl:AllDisjointClasses; owl:members (C1 … Cn)`.
  for (const [node, typed] of instancesOf(graph, V.allDisjointClasses)) {
    const members = objectsOf(graph, node, V.members);
    if (members.length !== 1) {
      issues.push({
        severity: 'error',
        code: 'malformed-axiom',
        message: `owl:AllDisjointClasses needs exactly one owl:members list, found ${members.length}`,
        subject: node,
        predicate: V.members,
        object: '',
        ...withSource(sourceOf(graph, typed)),
      });
      continue;
    }
    const [head, t] = members[0]!;
    const list = readList(graph, head, t);
    if ('error' in list) {
      issues.push({
        severity: 'error',
        code: 'malformed-axiom',
        message: `owl:members of owl:AllDisjointClasses: ${list.error}`,
        subject: node,
        predicate: V.members,
        object: head,
        ...withSource(list.triple === undefined ? undefined : sourceOf(graph, list.triple)),
      });
      continue;
    }
    const source = sourceOf(graph, t);
    const ids = list.items.map(([k]) => space.intern(k));
    for (let i = 0; i < ids.length; i++) {
      for (let j = i + 1; j < ids.length; j++) axioms.disjointWith.push({ a: ids[i]!, b: ids[j]!, source });
    }
  }
}

/** `{ source }` when known, `{}` otherwise (the record's `source` is optional, never undefined). */
export function withSource(source: SourceLocation | undefined): { source?: SourceLocation } {
  return source === undefined ? {} : { source };
}

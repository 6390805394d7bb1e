import type { SourceLocation } from '../findings.js';
import { row, type Graph } from '../graph/store.js';
import { TermKind, XSD } from '../graph/terms.js';
import { collectAxioms, emptyAxioms, withSource, type Axiom, type Characteristic } from './axioms.js';
import { findCycles } from './cycles.js';
import type { SchemaIssue } from './issues.js';
import { parseShapes, type Shape } from './shacl.js';
import { TermSpace } from './term-space.js';
import { V, shortName } from './vocab.js';

export type { SchemaIssue, SchemaIssueCode } from './issues.js';
export type { Shape, Constraint, Target, PropertyPath, NodeKind, ComponentName } from './shacl.js';
export { COMPONENT_IRI } from './shacl.js';
export type { Characteristic } from './axioms.js';
export { TermSpace } from './term-space.js';

/** A set of classes an entity has, after closure over rdfs:subClassOf: sorted ids and a set for lookups. */
export interface TypeSet {
  /** The rdf:type objects as asserted (sorted ids). */
  readonly asserted: readonly number[];
  /** Asserted types and all their superclasses (sorted ids). */
  readonly closed: readonly number[];
  readonly has: ReadonlySet<number>;
}

const EMPTY_TYPES: TypeSet = { asserted: [], closed: [], has: new Set() };
const EMPTY: readonly number[] = [];

/** Classes every resource belongs to: requiring them says nothing, and they tell nothing apart. */
const UNIVERSAL = new Set<string>([V.rdfsResource, V.owlThing]);

/** Datatypes of RDF 1.1 Concepts §5 that are not in the XSD namespace. */
const RDF_DATATYPES = new Set<string>([V.rdfsLiteral, V.langString, V.plainLiteral, V.xmlLiteral, V.html, V.json]);

/**
 * What the audited graph claims about itself: RDFS and OWL 2 axioms from the graph and from
 * `--schema` files, SHACL shapes from `--shapes` files, and the type closure of every entity.
 * Ids are those of {@link TermSpace}: the data graph's own term ids, extended.
 *
 * Reading RDFS as a constraint language is a choice: under the RDF 1.1 Semantics a domain or range
 * *entails* a type rather than requiring one (rule rdfs2/rdfs3). The checks report what the
 * entailment would add when the data does not assert it; {@link entailedTypes} gives the
 * entailments themselves.
 */
export class Schema {
  readonly space: TermSpace;
  readonly shapes: readonly Shape[];
  readonly issues: readonly SchemaIssue[];
  /** The data graph's id of rdf:type, or -1 when the graph has no rdf:type triple. */
  readonly typePredicate: number;

  private readonly superDirect = new Map<number, number[]>();
  private readonly subDirect = new Map<number, number[]>();
  private readonly superPropDirect = new Map<number, number[]>();
  private readonly subPropDirect = new Map<number, number[]>();
  private readonly domainDirect = new Map<number, number[]>();
  private readonly rangeDirect = new Map<number, number[]>();
  private readonly disjointDirect = new Map<number, Set<number>>();
  private readonly characteristics: Map<Characteristic, Map<number, SourceLocation | undefined>>;
  private readonly sources = new Map<string, SourceLocation | undefined>();
  private readonly memo = {
    supers: new Map<number, readonly number[]>(),
    subs: new Map<number, readonly number[]>(),
    superProps: new Map<number, readonly number[]>(),
    subProps: new Map<number, readonly number[]>(),
    domains: new Map<number, readonly number[]>(),
    ranges: new Map<number, readonly number[]>(),
    conflicts: new Map<number, ReadonlySet<number>>(),
  };
  private readonly typeSetOf: Int32Array;
  private readonly typeSets: TypeSet[] = [EMPTY_TYPES];
  private readonly universal: Set<number>;

  constructor(
    readonly graph: Graph,
    schemaGraphs: readonly Graph[] = [],
    shapesGraphs: readonly Graph[] = [],
  ) {
    this.space = new TermSpace(graph);
    const issues: SchemaIssue[] = [];
    const axioms = emptyAxioms();
    for (const g of [graph, ...schemaGraphs]) collectAxioms(g, this.space, axioms, issues);
    this.characteristics = axioms.characteristics;

    const edges = (list: readonly Axiom[], kind: string, up: Map<number, number[]>, down?: Map<number, number[]>): void => {
      for (const ax of list) {
        const key = `${kind} ${ax.a} ${ax.b}`;
        if (this.sources.has(key)) continue;
        this.sources.set(key, ax.source);
        push(up, ax.a, ax.b);
        if (down) push(down, ax.b, ax.a);
      }
    };
    edges(axioms.subClassOf, 'subClassOf', this.superDirect, this.subDirect);
    edges(axioms.subPropertyOf, 'subPropertyOf', this.superPropDirect, this.subPropDirect);
    edges(axioms.domain, 'domain', this.domainDirect);
    edges(axioms.range, 'range', this.rangeDirect);
    for (const ax of axioms.disjointWith) {
      addTo(this.disjointDirect, ax.a, ax.b);
      addTo(this.disjointDirect, ax.b, ax.a);
      for (const key of [`disjointWith ${ax.a} ${ax.b}`, `disjointWith ${ax.b} ${ax.a}`]) if (!this.sources.has(key)) this.sources.set(key, ax.source);
    }

    for (const [kind, list, code] of [
      ['rdfs:subClassOf', axioms.subClassOf, 'subclass-cycle'],
      ['rdfs:subPropertyOf', axioms.subPropertyOf, 'subproperty-cycle'],
    ] as const) {
      for (const { members, edge } of findCycles(list, axioms.equivalent)) {
        const names = members.slice(0, 6).map((m) => shortName(this.space.key(m)));
        issues.push({
          severity: 'warning',
          code,
          message:
            `${kind} cycle through ${names.join(', ')}${members.length > 6 ? ` and ${members.length - 6} more` : ''}: ` +
            'RDFS makes these equivalent; if that is not meant, remove one of the axioms',
          subject: this.space.key(edge.a),
          predicate: kind === 'rdfs:subClassOf' ? V.subClassOf : V.subPropertyOf,
          object: this.space.key(edge.b),
          ...withSource(edge.source),
        });
      }
    }

    const parsed = parseShapes(shapesGraphs);
    this.shapes = parsed.shapes;
    this.issues = [...issues, ...parsed.issues];
    this.universal = new Set([...UNIVERSAL].map((k) => this.space.id(k)).filter((id) => id >= 0));

    this.typePredicate = graph.terms.id(V.type);
    this.typeSetOf = new Int32Array(graph.terms.size);
    this.buildTypeSets();
  }

  /** Groups entities by their asserted types, so the closure is computed once per distinct set. */
  private buildTypeSets(): void {
    const g = this.graph;
    if (this.typePredicate < 0) return;
    const typeTriples = row(g.byPredicate, this.typePredicate);
    const count = new Int32Array(g.terms.size + 1);
    for (const t of typeTriples) count[g.s[t]! + 1]!++;
    for (let i = 0; i < g.terms.size; i++) count[i + 1]! += count[i]!;
    const start = count.slice();
    const classes = new Int32Array(typeTriples.length);
    for (const t of typeTriples) classes[start[g.s[t]!]!++] = g.o[t]!;
    const bySignature = new Map<string, number>();
    for (let e = 0; e < g.terms.size; e++) {
      const from = count[e]!;
      const to = count[e + 1]!;
      if (from === to) continue;
      const asserted = Array.from(classes.subarray(from, to)).sort((a, b) => a - b);
      const signature = asserted.length === 1 ? String(asserted[0]) : asserted.join(',');
      let index = bySignature.get(signature);
      if (index === undefined) {
        const closed = this.closeUp(asserted, this.superDirect);
        index = this.typeSets.length;
        this.typeSets.push({ asserted, closed, has: new Set(closed) });
        bySignature.set(signature, index);
      }
      this.typeSetOf[e] = index;
    }
  }

  /** Reflexive-transitive closure along `edges`, breadth-first; cycles end where a node repeats. */
  private closeUp(start: readonly number[], edges: Map<number, number[]>): number[] {
    const seen = new Set<number>(start);
    const queue = [...start];
    for (let i = 0; i < queue.length; i++) {
      for (const n of edges.get(queue[i]!) ?? EMPTY) {
        if (!seen.has(n)) {
          seen.add(n);
          queue.push(n);
        }
      }
    }
    return queue.sort((a, b) => a - b);
  }

  private memoClose(id: number, edges: Map<number, number[]>, memo: Map<number, readonly number[]>): readonly number[] {
    let out = memo.get(id);
    if (!out) memo.set(id, (out = this.closeUp([id], edges)));
    return out;
  }

  /** The class and all its superclasses, as ids (rdfs:subClassOf is reflexive and transitive: RDF 1.1 Semantics rules rdfs10, rdfs11). */
  superClasses(cls: number): readonly number[] {
    return this.memoClose(cls, this.superDirect, this.memo.supers);
  }

  /** The class and all its subclasses. */
  subClasses(cls: number): readonly number[] {
    return this.memoClose(cls, this.subDirect, this.memo.subs);
  }

  /** The property and all its super-properties (rules rdfs5, rdfs6). */
  superProperties(property: number): readonly number[] {
    return this.memoClose(property, this.superPropDirect, this.memo.superProps);
  }

  /** The property and all its sub-properties. */
  subProperties(property: number): readonly number[] {
    return this.memoClose(property, this.subPropDirect, this.memo.subProps);
  }

  /**
   * The classes a subject of `property` must have: the declared domains of the property and of its
   * super-properties (rdfs7 carries a triple up to the super-property, then rdfs2 applies), less
   * rdfs:Resource and owl:Thing, which every resource has.
   */
  domainsOf(property: number): readonly number[] {
    return this.inherited(property, this.domainDirect, this.memo.domains);
  }

  /** The classes or datatypes an object of `property` must have, inherited as {@link domainsOf}. */
  rangesOf(property: number): readonly number[] {
    return this.inherited(property, this.rangeDirect, this.memo.ranges);
  }

  private inherited(property: number, direct: Map<number, number[]>, memo: Map<number, readonly number[]>): readonly number[] {
    let out = memo.get(property);
    if (!out) {
      const set = new Set<number>();
      for (const p of this.superProperties(property)) for (const c of direct.get(p) ?? EMPTY) if (!this.universal.has(c)) set.add(c);
      out = set.size === 0 ? EMPTY : [...set].sort((a, b) => a - b);
      memo.set(property, out);
    }
    return out;
  }

  /** Whether `cls` names a datatype: XSD's, RDF's own, or one declared `rdf:type rdfs:Datatype`. */
  isDatatype(cls: number): boolean {
    const key = this.space.key(cls);
    return key.startsWith(XSD) || RDF_DATATYPES.has(key) || this.hasCharacteristic(cls, 'datatype');
  }

  /**
   * What the objects of `property` must be: `literal` when a range is a datatype or the property is
   * an owl:DatatypeProperty, `resource` when a range is a class or it is an owl:ObjectProperty;
   * undefined when nothing is declared or the declarations disagree.
   */
  expectedObject(property: number): 'literal' | 'resource' | undefined {
    let literal = false;
    let resource = false;
    for (const r of this.rangesOf(property)) {
      if (this.isDatatype(r)) literal = true;
      else resource = true;
    }
    for (const p of this.superProperties(property)) {
      if (this.hasCharacteristic(p, 'datatypeProperty')) literal = true;
      if (this.hasCharacteristic(p, 'objectProperty')) resource = true;
    }
    return literal === resource ? undefined : literal ? 'literal' : 'resource';
  }

  /** The index of an entity's type set (0: no asserted type), for callers that cache per set. */
  typeSetIndex(entity: number): number {
    return entity >= 0 && entity < this.typeSetOf.length ? this.typeSetOf[entity]! : 0;
  }

  typeSet(index: number): TypeSet {
    return this.typeSets[index] ?? EMPTY_TYPES;
  }

  /** The number of distinct type sets (index 0, the empty set, included). */
  get typeSetCount(): number {
    return this.typeSets.length;
  }

  /** The entity's classes: asserted rdf:type objects and all their superclasses (RDF 1.1 Semantics rdfs9), sorted ids. */
  typesOf(entity: number): readonly number[] {
    return this.typeSet(this.typeSetIndex(entity)).closed;
  }

  assertedTypesOf(entity: number): readonly number[] {
    return this.typeSet(this.typeSetIndex(entity)).asserted;
  }

  hasType(entity: number, cls: number): boolean {
    return this.typeSet(this.typeSetIndex(entity)).has.has(cls);
  }

  /** Classes declared disjoint with `cls` itself. */
  disjointWith(cls: number): ReadonlySet<number> {
    return this.disjointDirect.get(cls) ?? EMPTY_SET;
  }

  /**
   * The classes no instance of `cls` can have: those declared disjoint with `cls` or with one of its
   * superclasses. Since type sets are closed upwards, an entity conflicts with `cls` exactly when one
   * of its types is in this set.
   */
  conflictsWith(cls: number): ReadonlySet<number> {
    let out = this.memo.conflicts.get(cls);
    if (!out) {
      const set = new Set<number>();
      for (const sup of this.superClasses(cls)) for (const d of this.disjointWith(sup)) set.add(d);
      out = set.size === 0 ? EMPTY_SET : set;
      this.memo.conflicts.set(cls, out);
    }
    return out;
  }

  /** The declared disjoint pairs [a, b] (a < b) inside a closed type set. */
  disjointPairs(types: TypeSet): Array<[number, number]> {
    const out: Array<[number, number]> = [];
    if (this.disjointDirect.size === 0) return out;
    for (const a of types.closed) {
      for (const b of this.disjointWith(a)) if (a < b && types.has.has(b)) out.push([a, b]);
    }
    return out;
  }

  hasCharacteristic(property: number, characteristic: Characteristic): boolean {
    return this.characteristics.get(characteristic)?.has(property) ?? false;
  }

  /** The properties declared with `characteristic` (owl:FunctionalProperty, …), with where each was declared. */
  withCharacteristic(characteristic: Characteristic): ReadonlyMap<number, SourceLocation | undefined> {
    return this.characteristics.get(characteristic) ?? new Map();
  }

  /** Where an axiom was declared: `kind` is `domain`, `range`, `subClassOf`, `subPropertyOf` or `disjointWith`. */
  axiomSource(kind: 'domain' | 'range' | 'subClassOf' | 'subPropertyOf' | 'disjointWith', a: number, b: number): SourceLocation | undefined {
    return this.sources.get(`${kind} ${a} ${b}`);
  }

  /** The property (the argument or a super-property) whose declared domain or range is `cls`, for evidence. */
  declaringProperty(kind: 'domain' | 'range', property: number, cls: number): number {
    const direct = kind === 'domain' ? this.domainDirect : this.rangeDirect;
    return this.superProperties(property).find((p) => direct.get(p)?.includes(cls)) ?? property;
  }

  /**
   * The types RDFS entailment gives an entity (RDF 1.1 Semantics §9.2.1: rules rdfs2 and rdfs3 over
   * the entity's triples, with rdfs7 carrying them to super-properties, then rdfs9 and rdfs11 over
   * subclasses), beyond reading domain and range as constraints.
   */
  entailedTypes(entity: number): readonly number[] {
    const g = this.graph;
    const start = new Set<number>(this.assertedTypesOf(entity));
    for (const t of row(g.bySubject, entity)) for (const c of this.domainsOf(g.p[t]!)) start.add(c);
    for (const t of row(g.byObject, entity)) {
      for (const c of this.rangesOf(g.p[t]!)) if (g.terms.kind(entity) !== TermKind.Literal || this.isDatatype(c)) start.add(c);
    }
    return this.closeUp([...start], this.superDirect);
  }

  key(id: number): string {
    return this.space.key(id);
  }

  id(key: string): number {
    return this.space.id(key);
  }
}

const EMPTY_SET: ReadonlySet<number> = new Set();

function push(map: Map<number, number[]>, a: number, b: number): void {
  const list = map.get(a);
  if (!list) map.set(a, [b]);
  else list.push(b);
}

function addTo(map: Map<number, Set<number>>, a: number, b: number): void {
  let set = map.get(a);
  if (!set) map.set(a, (set = new Set()));
  set.add(b);
}

/**
 * Reads the schema of an audited graph: axioms stated in the graph itself and in `schemaGraphs`
 * (ontologies given with `--schema`), and the shapes of `shapesGraphs` (`--shapes`). Schema and
 * shapes graphs have their own term dictionaries; their terms are matched to the data's by key.
 * Never throws for a problem in the schema: those become {@link Schema.issues}.
 */
export function loadSchema(graph: Graph, schemaGraphs: readonly Graph[] = [], shapesGraphs: readonly Graph[] = []): Schema {
  return new Schema(graph, schemaGraphs, shapesGraphs);
}

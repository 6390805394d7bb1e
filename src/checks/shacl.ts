import type { Finding } from '../findings.js';
import { row } from '../graph/store.js';
import { TermKind, literalParts, termKind } from '../graph/terms.js';
import { COMPONENT_IRI, type Constraint, type Shape, type Target } from '../schema/index.js';
import { shortName } from '../schema/vocab.js';
import { compareLiterals, lexicalProblem } from '../schema/xsd.js';
import type { Check, CheckContext, ReportInput } from './types.js';
import { at, compact, datatypeOfKey, firstTripleOf } from './util.js';

/**
 * SHACL Core validation for the subset `src/schema/shacl.ts` reads (W3C SHACL §2–§4). A node is
 * identified by its data term id, or by key alone when a target names a node the data lacks (-1).
 * One finding per validation result: focus node, path, component, value, as SHACL §3.6 defines them.
 */
interface Node {
  id: number;
  key: string;
}

interface Value extends Node {
  /** The data triple that links the focus node and this value (-1 for a node shape's own focus node). */
  triple: number;
}

const MESSAGES: Record<Constraint['component'], string> = {
  class: '{value} is not an instance of {expected}',
  datatype: '{value} does not have datatype {expected}',
  nodeKind: '{value} is not of node kind {expected}',
  minCount: '{focus} has {count} values of {path}, fewer than sh:minCount {expected}',
  maxCount: '{focus} has {count} values of {path}, more than sh:maxCount {expected}',
  minInclusive: '{value} is not greater than or equal to {expected}',
  maxInclusive: '{value} is not less than or equal to {expected}',
  minExclusive: '{value} is not greater than {expected}',
  maxExclusive: '{value} is not less than {expected}',
  minLength: '{value} is shorter than sh:minLength {expected}',
  maxLength: '{value} is longer than sh:maxLength {expected}',
  pattern: '{value} does not match sh:pattern {expected}',
  in: '{value} is not one of {expected}',
  hasValue: '{focus} does not have the value {expected} for {path}',
};

export const shacl: Check = {
  meta: {
    id: 'shacl',
    title: 'SHACL shape not satisfied',
    severity: 'error',
    description:
      'A focus node of a shape from --shapes breaks one of its constraints (SHACL Core subset: targets, predicate ' +
      'and inverse paths, sh:class, datatype, nodeKind, minCount, maxCount, in, hasValue, pattern, value ranges, ' +
      'lengths). Severity follows sh:severity; the message follows sh:message when the shape gives one.',
    messages: { ...MESSAGES, custom: '{message}' },
  },
  run(ctx) {
    const findings: Finding[] = [];
    const validator = new Validator(ctx, findings);
    for (const shape of ctx.schema.shapes) {
      if (shape.deactivated || shape.targets.length === 0) continue;
      validator.validate(shape, validator.focusNodes(shape.targets));
    }
    return findings;
  },
};

class Validator {
  private readonly keys: readonly string[];
  private readonly idCache = new Map<string, number>();
  /** Per value component, the verdict on each value term seen: values repeat a lot (numbers, codes, classes). */
  private readonly verdicts = new Map<Constraint, Map<number, boolean>>();

  private readonly hasNamedGraphs: boolean;

  constructor(
    private readonly ctx: CheckContext,
    private readonly findings: Finding[],
  ) {
    this.keys = ctx.graph.terms.allKeys();
    this.hasNamedGraphs = ctx.graph.g.some((g) => g >= 0);
  }

  /** SHACL §2.1.3: the union of the shape's targets, deduplicated, in term order. */
  focusNodes(targets: readonly Target[]): Node[] {
    const { graph, schema } = this.ctx;
    const ids = new Set<number>();
    const absent = new Set<string>();
    for (const target of targets) {
      const id = graph.terms.id(target.value);
      switch (target.kind) {
        case 'node':
          if (id >= 0) ids.add(id);
          else absent.add(target.value);
          break;
        case 'class': {
          // SHACL instances: rdf:type of the class or of one of its subclasses (§1.5, SHACL instance).
          const cls = schema.id(target.value);
          if (cls < 0 || schema.typePredicate < 0) break;
          for (const sub of schema.subClasses(cls)) {
            for (const t of row(graph.byObject, sub)) if (graph.p[t] === schema.typePredicate) ids.add(graph.s[t]!);
          }
          break;
        }
        case 'subjectsOf':
          for (const t of row(graph.byPredicate, id)) ids.add(graph.s[t]!);
          break;
        case 'objectsOf':
          for (const t of row(graph.byPredicate, id)) ids.add(graph.o[t]!);
          break;
      }
    }
    const nodes: Node[] = [...ids].sort((a, b) => a - b).map((id) => ({ id, key: this.keys[id]! }));
    for (const key of absent) nodes.push({ id: -1, key });
    return nodes;
  }

  validate(shape: Shape, focus: readonly Node[]): void {
    if (shape.kind === 'property') {
      for (const f of focus) this.property(shape, f);
      return;
    }
    if (shape.constraints.length > 0) {
      for (const f of focus) {
        // A node shape's value node is the focus node itself.
        this.ids[0] = f.id;
        this.triples[0] = -1;
        for (const c of shape.constraints) this.constraint(shape, c, f, 1);
      }
    }
    for (const ps of shape.properties) {
      if (ps.deactivated) continue;
      for (const f of focus) this.property(ps, f);
    }
  }

  /** Value nodes of the current focus node, in reused buffers: term ids and the triples that link them. */
  private ids = new Int32Array(64);
  private triples = new Int32Array(64);

  /** SHACL §2.3.1: fills the buffers with the value nodes of a predicate path, or of its inverse; returns how many. */
  private values(shape: Shape, focus: Node): number {
    const { graph } = this.ctx;
    const path = shape.path!;
    const p = this.dataId(path.predicate);
    if (focus.id < 0 || p < 0) return 0;
    const index = path.inverse ? graph.byObject : graph.bySubject;
    const other = path.inverse ? graph.s : graph.o;
    const P = graph.p;
    const rows = index.triples;
    let n = 0;
    for (let i = index.offsets[focus.id]!, end = index.offsets[focus.id + 1]!; i < end; i++) {
      const t = rows[i]!;
      if (P[t] !== p) continue;
      const v = other[t]!;
      if (this.hasNamedGraphs && this.ids.subarray(0, n).includes(v)) continue; // the same value in two named graphs
      if (n === this.ids.length) this.grow();
      this.ids[n] = v;
      this.triples[n++] = t;
    }
    return n;
  }

  private grow(): void {
    const ids = new Int32Array(this.ids.length * 2);
    ids.set(this.ids);
    const triples = new Int32Array(this.triples.length * 2);
    triples.set(this.triples);
    this.ids = ids;
    this.triples = triples;
  }

  private property(shape: Shape, focus: Node): void {
    const n = this.values(shape, focus);
    for (const c of shape.constraints) this.constraint(shape, c, focus, n);
  }

  private dataId(key: string): number {
    let id = this.idCache.get(key);
    if (id === undefined) {
      id = this.ctx.graph.terms.id(key);
      this.idCache.set(key, id);
    }
    return id;
  }

  /** Value `i` of the buffers as a node (the focus node's key when it is not in the data). */
  private value(i: number, focus: Node): Value {
    const id = this.ids[i]!;
    return { id, key: id < 0 ? focus.key : this.keys[id]!, triple: this.triples[i]! };
  }

  private constraint(shape: Shape, c: Constraint, focus: Node, n: number): void {
    switch (c.component) {
      case 'minCount':
        if (n < c.value) this.report(shape, c, focus, undefined, { count: n, expected: c.value });
        return;
      case 'maxCount':
        if (n > c.value) this.report(shape, c, focus, undefined, { count: n, expected: c.value }, this.triples[c.value]!);
        return;
      case 'hasValue': {
        const want = this.dataId(c.value);
        let found = false;
        for (let i = 0; i < n && !found; i++) found = this.ids[i]! >= 0 ? this.ids[i] === want : focus.key === c.value;
        if (!found) this.report(shape, c, focus, undefined, { expected: shortName(c.value) });
        return;
      }
      default: {
        let seen = this.verdicts.get(c);
        if (!seen) this.verdicts.set(c, (seen = new Map()));
        for (let i = 0; i < n; i++) {
          const id = this.ids[i]!;
          // sh:class depends on the value's type set, everything else on the term alone.
          const key = id < 0 ? -1 : c.component === 'class' ? -2 - this.ctx.schema.typeSetIndex(id) : id;
          let ok = key === -1 ? undefined : seen.get(key);
          if (ok === undefined) {
            ok = this.conforms(c, this.value(i, focus));
            if (key !== -1) seen.set(key, ok);
          }
          if (!ok) this.report(shape, c, focus, this.value(i, focus), { expected: expectedText(c) });
        }
      }
    }
  }

  /** Whether one value node satisfies a value-type, range, string or list component (SHACL §4.1, §4.3, §4.4, §4.8). */
  private conforms(c: Constraint, v: Node): boolean {
    const kind = termKind(v.key);
    switch (c.component) {
      case 'class': {
        const cls = this.ctx.schema.id(c.value);
        return kind !== TermKind.Literal && cls >= 0 && this.ctx.schema.hasType(v.id, cls);
      }
      case 'datatype':
        // §4.1.2: the datatype must match exactly, and the literal must be well-formed for it.
        return kind === TermKind.Literal && datatypeOfKey(v.key) === c.value && lexicalProblem(literalParts(v.key).lexical, c.value) === undefined;
      case 'nodeKind':
        return nodeKindMatches(c.value, kind);
      case 'in':
        return c.values.includes(v.key);
      case 'minInclusive':
      case 'maxInclusive':
      case 'minExclusive':
      case 'maxExclusive': {
        const cmp = compareLiterals(v.key, c.value);
        if (cmp === undefined) return false;
        if (c.component === 'minInclusive') return cmp >= 0;
        if (c.component === 'maxInclusive') return cmp <= 0;
        if (c.component === 'minExclusive') return cmp > 0;
        return cmp < 0;
      }
      case 'minLength':
      case 'maxLength': {
        if (kind === TermKind.Blank) return false;
        const length = [...stringValue(v.key)].length;
        return c.component === 'minLength' ? length >= c.value : length <= c.value;
      }
      case 'pattern':
        if (kind === TermKind.Blank) return false;
        c.regex.lastIndex = 0;
        return c.regex.test(stringValue(v.key));
      default:
        return true;
    }
  }

  private report(shape: Shape, c: Constraint, focus: Node, value: Value | undefined, data: Record<string, string | number>, countTriple?: number): void {
    const { graph } = this.ctx;
    const path = shape.path;
    const pathText = path ? (path.inverse ? `^${shortName(path.predicate)}` : shortName(path.predicate)) : undefined;
    const evidence = compact({
      shape: shape.node,
      shapeSource: at(shape.source),
      constraintSource: at(c.source),
      component: COMPONENT_IRI[c.component],
      focusNode: focus.key,
      path: path ? (path.inverse ? `^<${path.predicate}>` : `<${path.predicate}>`) : undefined,
      value: value?.key,
      expected: expectedEvidence(c),
      count: typeof data.count === 'number' ? data.count : undefined,
      severity: shape.severityIri,
    });
    const texts = {
      ...data,
      focus: shortName(focus.key),
      path: pathText ?? '(the node itself)',
      value: value ? shorten(value.key) : shortName(focus.key),
      ...(shape.message !== undefined ? { message: shape.message } : {}),
    };
    const input: ReportInput = {
      messageId: shape.message !== undefined ? 'custom' : c.component,
      severity: shape.severity,
      data: texts,
      evidence,
    };
    if (value && value.triple >= 0) {
      // The value's own triple: (focus, p, value), or (value, p, focus) for an inverse path.
      input.triple = value.triple;
    } else {
      // Not about one triple: the focus node as subject, the path as predicate, no object.
      const t = countTriple ?? firstTripleOf(graph, focus.id);
      if (t >= 0) input.triple = t;
      input.subject = focus.key;
      input.predicate = path?.predicate ?? '';
      input.object = '';
      if (shape.source) input.source = shape.source;
    }
    this.findings.push(this.ctx.finding(input));
  }
}

function nodeKindMatches(nodeKind: string, kind: TermKind): boolean {
  switch (kind) {
    case TermKind.Iri:
      return nodeKind === 'IRI' || nodeKind === 'BlankNodeOrIRI' || nodeKind === 'IRIOrLiteral';
    case TermKind.Blank:
      return nodeKind === 'BlankNode' || nodeKind === 'BlankNodeOrIRI' || nodeKind === 'BlankNodeOrLiteral';
    default:
      return nodeKind === 'Literal' || nodeKind === 'BlankNodeOrLiteral' || nodeKind === 'IRIOrLiteral';
  }
}

/** SPARQL's str(): the lexical form of a literal, the IRI itself for an IRI. */
function stringValue(key: string): string {
  return termKind(key) === TermKind.Literal ? literalParts(key).lexical : key;
}

function shorten(key: string): string {
  const s = shortName(key);
  return s.length > 80 ? `${s.slice(0, 77)}…` : s;
}

function expectedText(c: Constraint): string {
  switch (c.component) {
    case 'in':
      return `(${c.values.map(shortName).join(' ')})`;
    case 'pattern':
      return JSON.stringify(c.value) + (c.flags ? ` (flags "${c.flags}")` : '');
    case 'nodeKind':
      return `sh:${c.value}`;
    case 'minCount':
    case 'maxCount':
    case 'minLength':
    case 'maxLength':
      return String(c.value);
    default:
      return shortName(c.value);
  }
}

function expectedEvidence(c: Constraint): unknown {
  switch (c.component) {
    case 'in':
      return c.values;
    case 'pattern':
      return { pattern: c.value, flags: c.flags };
    case 'nodeKind':
      return `http://www.w3.org/ns/shacl#${c.value}`;
    default:
      return c.value;
  }
}

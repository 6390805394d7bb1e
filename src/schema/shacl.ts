import type { Severity, SourceLocation } from '../findings.js';
import type { Graph } from '../graph/store.js';
import { SH, TermKind, XSD, literalParts, termKind } from '../graph/terms.js';
import { withSource } from './axioms.js';
import { instancesOf, propertiesOf, readList, sourceOf, triplesWith } from './graph-access.js';
import type { SchemaIssue } from './issues.js';
import { V, shortName } from './vocab.js';

/**
 * The SHACL Core subset plumb evaluates (W3C Shapes Constraint Language, Recommendation 2017):
 * node shapes and property shapes (§2.1, §2.3) with the four explicit target kinds and implicit
 * class targets (§2.1.3); a path that is a predicate or the inverse of one (§2.3.1.1, §2.3.1.3); the
 * components of §4.1 (sh:class, sh:datatype, sh:nodeKind), §4.2 (sh:minCount, sh:maxCount), §4.3
 * (value ranges), §4.4 (sh:minLength, sh:maxLength, sh:pattern with sh:flags), §4.8 (sh:in,
 * sh:hasValue); sh:severity, sh:message and sh:deactivated (§2.1.4–§2.1.6).
 *
 * Every other `sh:` term in a shapes graph is reported by name as `unsupported-shacl`, so a shapes
 * file never passes because plumb skipped part of it.
 */

export type NodeKind = 'IRI' | 'BlankNode' | 'Literal' | 'BlankNodeOrIRI' | 'BlankNodeOrLiteral' | 'IRIOrLiteral';
const NODE_KINDS = new Set<string>(['IRI', 'BlankNode', 'Literal', 'BlankNodeOrIRI', 'BlankNodeOrLiteral', 'IRIOrLiteral']);

export interface PropertyPath {
  predicate: string;
  inverse: boolean;
}

export type Constraint = { source?: SourceLocation } & (
  | { component: 'class'; value: string }
  | { component: 'datatype'; value: string }
  | { component: 'nodeKind'; value: NodeKind }
  | { component: 'minCount' | 'maxCount' | 'minLength' | 'maxLength'; value: number }
  | { component: 'minInclusive' | 'maxInclusive' | 'minExclusive' | 'maxExclusive'; value: string }
  | { component: 'in'; values: string[] }
  | { component: 'hasValue'; value: string }
  | { component: 'pattern'; value: string; flags: string; regex: RegExp }
);
export type ComponentName = Constraint['component'];

/** The IRI of each component (SHACL §4), as validation results name them. */
export const COMPONENT_IRI: Record<ComponentName, string> = {
  class: `${SH}ClassConstraintComponent`,
  datatype: `${SH}DatatypeConstraintComponent`,
  nodeKind: `${SH}NodeKindConstraintComponent`,
  minCount: `${SH}MinCountConstraintComponent`,
  maxCount: `${SH}MaxCountConstraintComponent`,
  minInclusive: `${SH}MinInclusiveConstraintComponent`,
  maxInclusive: `${SH}MaxInclusiveConstraintComponent`,
  minExclusive: `${SH}MinExclusiveConstraintComponent`,
  maxExclusive: `${SH}MaxExclusiveConstraintComponent`,
  minLength: `${SH}MinLengthConstraintComponent`,
  maxLength: `${SH}MaxLengthConstraintComponent`,
  pattern: `${SH}PatternConstraintComponent`,
  in: `${SH}InConstraintComponent`,
  hasValue: `${SH}HasValueConstraintComponent`,
};

export type Target =
  | { kind: 'class'; value: string }
  | { kind: 'node'; value: string }
  | { kind: 'subjectsOf'; value: string }
  | { kind: 'objectsOf'; value: string };

export interface Shape {
  /** The shape's own term key (an IRI or a blank node of the shapes graph). */
  node: string;
  kind: 'node' | 'property';
  /** Present on property shapes. */
  path?: PropertyPath;
  targets: Target[];
  constraints: Constraint[];
  /** The property shapes a node shape links with sh:property. */
  properties: Shape[];
  severity: Severity;
  /** sh:Violation, sh:Warning, sh:Info, or another IRI a shapes author chose. */
  severityIri: string;
  message?: string;
  deactivated: boolean;
  source?: SourceLocation;
}

const sh = (local: string): string => `${SH}${local}`;

const TARGETS: ReadonlyArray<readonly [Target['kind'], string]> = [
  ['class', sh('targetClass')],
  ['node', sh('targetNode')],
  ['subjectsOf', sh('targetSubjectsOf')],
  ['objectsOf', sh('targetObjectsOf')],
];
const COMPONENT_PARAMETERS: readonly ComponentName[] = [
  'class', 'datatype', 'nodeKind', 'minCount', 'maxCount', 'minInclusive', 'maxInclusive', 'minExclusive',
  'maxExclusive', 'minLength', 'maxLength', 'pattern', 'in', 'hasValue',
];
/** Parameters that SHACL allows at most once per shape (§4: "at most one value"). */
const SINGLE_VALUED = new Set<string>(['datatype', 'nodeKind', 'minCount', 'maxCount', 'minInclusive', 'maxInclusive', 'minExclusive', 'maxExclusive', 'minLength', 'maxLength', 'in', 'flags']);
/** SHACL §1.5/§2.3.2: non-validating properties, and the shape-structure terms plumb understands. */
const UNDERSTOOD = new Set<string>([
  ...TARGETS.map(([, iri]) => iri),
  ...COMPONENT_PARAMETERS.map(sh),
  ...['property', 'path', 'inversePath', 'flags', 'severity', 'message', 'deactivated'].map(sh),
  ...['name', 'description', 'order', 'group', 'defaultValue'].map(sh),
]);
const UNDERSTOOD_TYPES = new Set<string>(['NodeShape', 'PropertyShape', 'PropertyGroup', 'Shape'].map(sh));
const SEVERITIES: Record<string, Severity> = { [sh('Violation')]: 'error', [sh('Warning')]: 'warning', [sh('Info')]: 'note' };
const PATH_KINDS = ['alternativePath', 'zeroOrMorePath', 'oneOrMorePath', 'zeroOrOnePath'].map(sh);

export interface ParsedShapes {
  /** Every shape found, node and property, in the order first seen. */
  shapes: Shape[];
  issues: SchemaIssue[];
}

/** Reads the shapes of one or more shapes graphs. Problems become issues; a shape with a fatal problem is left out. */
export function parseShapes(graphs: readonly Graph[]): ParsedShapes {
  const shapes: Shape[] = [];
  const issues: SchemaIssue[] = [];
  for (const graph of graphs) new ShapesReader(graph, issues).read(shapes);
  return { shapes, issues };
}

class ShapesReader {
  private readonly byNode = new Map<string, Shape | null>();
  /** Property shape → the shape that links it with sh:property, and the linking triple. */
  private readonly linkedFrom = new Map<string, [string, number]>();

  constructor(
    private readonly graph: Graph,
    private readonly issues: SchemaIssue[],
  ) {}

  read(out: Shape[]): void {
    this.reportUnsupported();
    for (const node of this.shapeNodes()) {
      const shape = this.shape(node);
      if (shape) out.push(shape);
    }
  }

  private issue(code: SchemaIssue['code'], severity: Severity, message: string, s: string, p: string, o: string, t: number | undefined): void {
    this.issues.push({ severity, code, message, subject: s, predicate: p, object: o, ...withSource(t === undefined ? undefined : sourceOf(this.graph, t)) });
  }

  /** Every triple with an `sh:` predicate or an `sh:` class outside the subset, named with its line. */
  private reportUnsupported(): void {
    const g = this.graph;
    const keys = g.terms.allKeys();
    const typeId = g.terms.id(V.type);
    const flagged = new Set<number>();
    for (let p = 0; p < keys.length; p++) {
      const key = keys[p]!;
      if (!key.startsWith(SH) || UNDERSTOOD.has(key)) continue;
      const start = g.byPredicate.offsets[p]!;
      const end = g.byPredicate.offsets[p + 1]!;
      for (let i = start; i < end; i++) flagged.add(g.byPredicate.triples[i]!);
    }
    if (typeId >= 0) {
      for (let i = g.byPredicate.offsets[typeId]!; i < g.byPredicate.offsets[typeId + 1]!; i++) {
        const t = g.byPredicate.triples[i]!;
        const cls = keys[g.o[t]!]!;
        if (cls.startsWith(SH) && !UNDERSTOOD_TYPES.has(cls)) flagged.add(t);
      }
    }
    for (const t of [...flagged].sort((a, b) => a - b)) {
      const [s, p, o] = [keys[g.s[t]!]!, keys[g.p[t]!]!, keys[g.o[t]!]!];
      const term = p === V.type ? o : p;
      this.issue('unsupported-shacl', 'warning', `${shortName(term)} is outside plumb's SHACL Core subset and was not evaluated`, s, p, o, t);
    }
  }

  private shapeNodes(): string[] {
    const nodes = new Set<string>();
    for (const cls of [sh('NodeShape'), sh('PropertyShape')]) for (const [s] of instancesOf(this.graph, cls)) nodes.add(s);
    for (const [, iri] of TARGETS) for (const [s] of triplesWith(this.graph, iri)) nodes.add(s);
    for (const [s] of triplesWith(this.graph, sh('path'))) nodes.add(s);
    for (const c of COMPONENT_PARAMETERS) for (const [s] of triplesWith(this.graph, sh(c))) nodes.add(s);
    for (const [s, o, t] of triplesWith(this.graph, sh('property'))) {
      nodes.add(s);
      nodes.add(o);
      if (!this.linkedFrom.has(o)) this.linkedFrom.set(o, [s, t]);
    }
    return [...nodes];
  }

  /** The shape at `node`, parsed once; null when it cannot be evaluated (the reason is already an issue). */
  private shape(node: string): Shape | null {
    const known = this.byNode.get(node);
    if (known !== undefined) return known;
    this.byNode.set(node, null); // guards against sh:property cycles
    const props = propertiesOf(this.graph, node);
    const values = (p: string): Array<[string, number]> => props.filter(([q]) => q === p).map(([, o, t]) => [o, t]);
    const firstTriple = props[0]?.[2];

    for (const local of SINGLE_VALUED) {
      const param = sh(local);
      const v = values(param);
      if (v.length > 1) {
        this.issue('malformed-shape', 'error', `${shortName(param)} may have at most one value on a shape, found ${v.length}`, node, param, v[1]![0], v[1]![1]);
        return null;
      }
    }

    let path: PropertyPath | undefined;
    const paths = values(sh('path'));
    if (paths.length > 1) {
      this.issue('malformed-shape', 'error', `a property shape has exactly one sh:path, found ${paths.length}`, node, sh('path'), paths[1]![0], paths[1]![1]);
      return null;
    }
    if (paths.length === 1) {
      const parsed = this.path(node, paths[0]![0], paths[0]![1]);
      if (!parsed) return null;
      path = parsed;
    } else {
      const link = this.linkedFrom.get(node);
      if (link) {
        this.issue('malformed-shape', 'error', `the property shape ${shortName(node)} linked with sh:property has no sh:path`, link[0], sh('property'), node, link[1]);
        return null;
      }
    }

    const targets: Target[] = [];
    for (const [kind, iri] of TARGETS) {
      for (const [value, t] of values(iri)) {
        if (kind !== 'node' && termKind(value) !== TermKind.Iri) {
          this.issue('malformed-shape', 'error', `${shortName(iri)} needs an IRI, not ${shortName(value)}`, node, iri, value, t);
          continue;
        }
        targets.push({ kind, value });
      }
    }
    // SHACL §2.1.3.3: a shape that is also an rdfs:Class targets its own instances.
    const types = values(V.type).map(([o]) => o);
    if (types.includes(V.rdfsClass) || types.includes(V.owlClass)) targets.push({ kind: 'class', value: node });

    const constraints: Constraint[] = [];
    const flagsValue = values(sh('flags'))[0];
    for (const component of COMPONENT_PARAMETERS) {
      for (const [value, t] of values(sh(component))) {
        const c = this.constraint(node, component, value, t, flagsValue, path !== undefined);
        if (c) constraints.push(c);
      }
    }

    let severityIri = sh('Violation');
    const sev = values(sh('severity'))[0];
    if (sev) severityIri = sev[0];
    const severity: Severity = SEVERITIES[severityIri] ?? 'error';
    const deactivated = values(sh('deactivated')).some(([v]) => v === `"true"^^<${XSD}boolean>`);
    const messages = values(sh('message')).map(([v]) => v);
    const message = pickMessage(messages);

    const shape: Shape = {
      node,
      kind: path ? 'property' : 'node',
      ...(path ? { path } : {}),
      targets,
      constraints,
      properties: [],
      severity,
      severityIri,
      ...(message !== undefined ? { message } : {}),
      deactivated,
      ...withSource(firstTriple === undefined ? undefined : sourceOf(this.graph, firstTriple)),
    };
    this.byNode.set(node, shape);

    for (const [child, t] of values(sh('property'))) {
      if (path) {
        // Understood on node shapes only, so reportUnsupported does not name this use.
        this.issue('unsupported-shacl', 'warning', 'sh:property on a property shape (nested property shapes) is outside plumb\'s SHACL Core subset and was not evaluated', node, sh('property'), child, t);
        continue;
      }
      const sub = this.shape(child);
      if (sub) shape.properties.push(sub);
    }
    return shape;
  }

  private path(shape: string, value: string, t: number): PropertyPath | undefined {
    const kind = termKind(value);
    if (kind === TermKind.Iri) return { predicate: value, inverse: false };
    if (kind === TermKind.Literal) {
      this.issue('malformed-shape', 'error', `sh:path must be an IRI or a blank node path, not the literal ${value}`, shape, sh('path'), value, t);
      return undefined;
    }
    const props = propertiesOf(this.graph, value);
    const inverse = props.filter(([p]) => p === sh('inversePath'));
    if (props.some(([p]) => PATH_KINDS.includes(p))) return undefined; // named by reportUnsupported
    if (props.some(([p]) => p === V.first)) {
      this.issue('unsupported-shacl', 'warning', 'sequence paths (an RDF list as sh:path) are outside plumb\'s SHACL Core subset; the shape was not evaluated', shape, sh('path'), value, t);
      return undefined;
    }
    if (inverse.length === 1 && props.length === 1) {
      const [, inner, it] = inverse[0]!;
      if (termKind(inner) === TermKind.Iri) return { predicate: inner, inverse: true };
      if (propertiesOf(this.graph, inner).some(([p]) => PATH_KINDS.includes(p))) return undefined;
      this.issue('unsupported-shacl', 'warning', 'sh:inversePath of a path other than a predicate is outside plumb\'s SHACL Core subset; the shape was not evaluated', shape, sh('inversePath'), inner, it);
      return undefined;
    }
    this.issue(
      'malformed-shape',
      'error',
      `malformed sh:path: the blank node ${value} needs exactly one of sh:inversePath, sh:alternativePath, sh:zeroOrMorePath, sh:oneOrMorePath, sh:zeroOrOnePath or an RDF list`,
      shape,
      sh('path'),
      value,
      props[0]?.[2] ?? t,
    );
    return undefined;
  }

  private constraint(shape: string, component: ComponentName, value: string, t: number, flags: [string, number] | undefined, isProperty: boolean): Constraint | undefined {
    const src = withSource(sourceOf(this.graph, t));
    const param = sh(component);
    const bad = (why: string): undefined => {
      this.issue('malformed-shape', 'error', `${shortName(param)} ${why}`, shape, param, value, t);
      return undefined;
    };
    const kind = termKind(value);
    switch (component) {
      case 'class':
      case 'datatype':
        if (kind !== TermKind.Iri) return bad(`needs an IRI, not ${shortName(value)}`);
        return { component, value, ...src };
      case 'nodeKind': {
        const local = value.startsWith(SH) ? value.slice(SH.length) : '';
        if (!NODE_KINDS.has(local)) return bad(`must be one of sh:IRI, sh:BlankNode, sh:Literal, sh:BlankNodeOrIRI, sh:BlankNodeOrLiteral, sh:IRIOrLiteral, not ${shortName(value)}`);
        return { component, value: local as NodeKind, ...src };
      }
      case 'minCount':
      case 'maxCount':
      case 'minLength':
      case 'maxLength': {
        if ((component === 'minCount' || component === 'maxCount') && !isProperty) return bad('applies to property shapes only (a shape with sh:path)');
        const n = kind === TermKind.Literal ? nonNegativeInteger(value) : undefined;
        if (n === undefined) return bad(`needs a non-negative xsd:integer, not ${shortName(value)}`);
        return { component, value: n, ...src };
      }
      case 'minInclusive':
      case 'maxInclusive':
      case 'minExclusive':
      case 'maxExclusive':
        if (kind !== TermKind.Literal) return bad(`needs a literal, not ${shortName(value)}`);
        return { component, value, ...src };
      case 'in': {
        const list = readList(this.graph, value, t);
        if ('error' in list) return bad(`needs an RDF list: ${list.error}`);
        return { component, values: list.items.map(([k]) => k), ...src };
      }
      case 'hasValue':
        return { component, value, ...src };
      case 'pattern': {
        if (kind !== TermKind.Literal) return bad(`needs a string literal, not ${shortName(value)}`);
        const source = literalParts(value).lexical;
        const flagText = flags && termKind(flags[0]) === TermKind.Literal ? literalParts(flags[0]).lexical : '';
        try {
          return { component, value: source, flags: flagText, regex: compilePattern(source, flagText), ...src };
        } catch (error) {
          const why = error instanceof Error ? error.message : String(error);
          this.issues.push({
            severity: 'error',
            code: 'invalid-pattern',
            message: `sh:pattern ${JSON.stringify(source)}${flagText ? ` with sh:flags "${flagText}"` : ''} is not a valid regular expression (${why}); the constraint was not evaluated`,
            subject: shape,
            predicate: param,
            object: value,
            ...src,
          });
          return undefined;
        }
      }
    }
  }
}

function nonNegativeInteger(key: string): number | undefined {
  const { lexical, datatype } = literalParts(key);
  if (datatype !== `${XSD}integer` && datatype !== `${XSD}nonNegativeInteger`) return undefined;
  if (!/^\+?[0-9]+$/.test(lexical)) return undefined;
  const n = Number(lexical);
  return Number.isSafeInteger(n) ? n : undefined;
}

/**
 * SHACL §4.4.3 takes regular expressions and flags as SPARQL's REGEX does (XPath functions §5.6.2):
 * flags `s`, `m`, `i` map onto JavaScript's; `x` removes whitespace from the pattern; `q` quotes it.
 */
export function compilePattern(pattern: string, flags: string): RegExp {
  let source = pattern;
  let js = '';
  for (const f of flags) {
    if (f === 's' || f === 'm' || f === 'i') {
      if (!js.includes(f)) js += f;
    } else if (f === 'x') source = source.replace(/[\t\n\r ]/g, '');
    else if (f === 'q') source = source.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
    else throw new SyntaxError(`unknown flag "${f}" (SHACL allows s, m, i, x, q)`);
  }
  return new RegExp(source, js);
}

/** sh:message may come in several languages: prefer an untagged one, then English, then the first. */
function pickMessage(keys: readonly string[]): string | undefined {
  if (keys.length === 0) return undefined;
  const parts = keys.filter((k) => termKind(k) === TermKind.Literal).map(literalParts);
  const pick = parts.find((p) => p.language === undefined) ?? parts.find((p) => p.language?.startsWith('en')) ?? parts[0];
  return pick?.lexical;
}

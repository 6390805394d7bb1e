/**
 * A second opinion: plumb's SHACL violations against those of rdf-validate-shacl (a general-purpose
 * SHACL engine, Zazuko, npm `rdf-validate-shacl` 0.6, on the RDF/JS factory `@zazuko/env-node`), on a
 * battery of shapes-and-data pairs written for this test, covering every component of plumb's subset
 * and its edge cases. A violation is compared by focus node, path, constraint component, value and
 * severity (SHACL §3.6.2, the properties of a validation result); blank nodes compare as "a blank node".
 *
 * Left out on purpose, where the two engines read the specification differently: comparing a dateTime
 * with a timezone to one without (plumb follows XSD 1.1's partial order, the other treats every such
 * pair as incomparable), strings compared with sh:minInclusive & co. (the other uses locale order),
 * string lengths outside the Basic Multilingual Plane (the other counts UTF-16 code units), and a date
 * with a day its month does not have, which XSD 1.1 Part 2 §D.3.3 excludes and the other accepts (the
 * last test below pins that difference down).
 */
import rdf from '@zazuko/env-node';
import { Parser, type Quad, type Term } from 'n3';
import SHACLValidator from 'rdf-validate-shacl';
import { describe, expect, it } from 'vitest';
import { runChecks } from '../../src/checks/index.js';
import { literalKey } from '../../src/graph/terms.js';
import { loadSchema } from '../../src/schema/index.js';
import { turtle } from '../checks/helpers.js';

const SH = 'http://www.w3.org/ns/shacl#';
const PREFIXES =
  '@prefix ex: <http://example.org/> . @prefix rdf: <http://www.w3.org/1999/02/22-rdf-syntax-ns#> . ' +
  '@prefix rdfs: <http://www.w3.org/2000/01/rdf-schema#> . @prefix xsd: <http://www.w3.org/2001/XMLSchema#> . ' +
  '@prefix sh: <http://www.w3.org/ns/shacl#> . ';

interface Pair {
  name: string;
  shapes: string;
  data: string;
}

const ps = (path: string, constraints: string, target = 'sh:targetClass ex:C'): string => `ex:S ${target} ; sh:property [ sh:path ${path} ; ${constraints} ] .`;
const typed = (body: string): string => `ex:a a ex:C . ex:b a ex:C . ${body}`;

/** The battery: each pair names what it covers. */
const PAIRS: Pair[] = [
  // sh:class (§4.1.1)
  { name: 'class: instance, non-instance, literal', shapes: ps('ex:p', 'sh:class ex:D'), data: typed('ex:a ex:p ex:d1 . ex:d1 a ex:D . ex:b ex:p ex:x, "lit" .') },
  { name: 'class: instance of a subclass', shapes: ps('ex:p', 'sh:class ex:D'), data: typed('ex:E rdfs:subClassOf ex:D . ex:a ex:p ex:e . ex:e a ex:E .') },
  { name: 'class: two sh:class values must both hold', shapes: ps('ex:p', 'sh:class ex:D, ex:F'), data: typed('ex:a ex:p ex:x . ex:x a ex:D .') },
  { name: 'class on a node shape', shapes: 'ex:S sh:targetNode ex:a, ex:b ; sh:class ex:D .', data: 'ex:a a ex:D . ex:b ex:p 1 .' },
  // sh:datatype (§4.1.2)
  { name: 'datatype: exact match only', shapes: ps('ex:p', 'sh:datatype xsd:integer'), data: typed('ex:a ex:p 1, "1"^^xsd:int, "1", 1.5 .') },
  { name: 'datatype: ill-formed literal of the right datatype', shapes: ps('ex:p', 'sh:datatype xsd:integer'), data: typed('ex:a ex:p "one"^^xsd:integer .') },
  { name: 'datatype: language-tagged string', shapes: ps('ex:p', 'sh:datatype rdf:langString'), data: typed('ex:a ex:p "x"@en, "y", ex:z .') },
  { name: 'datatype: xsd:date and xsd:boolean', shapes: ps('ex:p', 'sh:datatype xsd:date') + ps('ex:q', 'sh:datatype xsd:boolean').replace('ex:S', 'ex:T'), data: typed('ex:a ex:p "20-02-03"^^xsd:date, "2020-02-28"^^xsd:date ; ex:q true, "yes"^^xsd:boolean .') },
  // sh:nodeKind (§4.1.3)
  { name: 'nodeKind IRI', shapes: ps('ex:p', 'sh:nodeKind sh:IRI'), data: typed('ex:a ex:p ex:x, _:b1, "l" .') },
  { name: 'nodeKind BlankNode', shapes: ps('ex:p', 'sh:nodeKind sh:BlankNode'), data: typed('ex:a ex:p ex:x, _:b1, "l" .') },
  { name: 'nodeKind Literal', shapes: ps('ex:p', 'sh:nodeKind sh:Literal'), data: typed('ex:a ex:p ex:x, _:b1, "l" .') },
  { name: 'nodeKind BlankNodeOrIRI', shapes: ps('ex:p', 'sh:nodeKind sh:BlankNodeOrIRI'), data: typed('ex:a ex:p ex:x, _:b1, "l" .') },
  { name: 'nodeKind BlankNodeOrLiteral', shapes: ps('ex:p', 'sh:nodeKind sh:BlankNodeOrLiteral'), data: typed('ex:a ex:p ex:x, _:b1, "l" .') },
  { name: 'nodeKind IRIOrLiteral', shapes: ps('ex:p', 'sh:nodeKind sh:IRIOrLiteral'), data: typed('ex:a ex:p ex:x, _:b1, "l" .') },
  // sh:minCount, sh:maxCount (§4.2)
  { name: 'minCount 1 and 2', shapes: ps('ex:p', 'sh:minCount 2'), data: typed('ex:a ex:p 1 . ex:b ex:p 1, 2 .') },
  { name: 'minCount on a node with no triples at all', shapes: ps('ex:p', 'sh:minCount 1', 'sh:targetNode ex:ghost'), data: 'ex:a ex:p 1 .' },
  { name: 'maxCount 1', shapes: ps('ex:p', 'sh:maxCount 1'), data: typed('ex:a ex:p 1, 2, 3 . ex:b ex:p 1 .') },
  { name: 'maxCount 0', shapes: ps('ex:p', 'sh:maxCount 0'), data: typed('ex:a ex:p 1 .') },
  { name: 'inverse path counts', shapes: ps('[ sh:inversePath ex:p ]', 'sh:minCount 1 ; sh:maxCount 1'), data: typed('ex:x ex:p ex:a . ex:y ex:p ex:a .') },
  { name: 'inverse path values', shapes: ps('[ sh:inversePath ex:p ]', 'sh:class ex:D', 'sh:targetNode ex:a'), data: 'ex:x ex:p ex:a . ex:y ex:p ex:a . ex:y a ex:D .' },
  // sh:in, sh:hasValue (§4.8)
  { name: 'in: IRIs', shapes: ps('ex:p', 'sh:in ( ex:r ex:g )'), data: typed('ex:a ex:p ex:r, ex:b2 .') },
  { name: 'in: literals compare as terms, datatype included', shapes: ps('ex:p', 'sh:in ( 1 "two" )'), data: typed('ex:a ex:p 1, "1", "two", "01"^^xsd:integer .') },
  { name: 'in: the empty list', shapes: ps('ex:p', 'sh:in ()'), data: typed('ex:a ex:p 1 .') },
  { name: 'in on a node shape', shapes: 'ex:S sh:targetSubjectsOf ex:p ; sh:in ( ex:a ) .', data: 'ex:a ex:p 1 . ex:b ex:p 2 .' },
  { name: 'hasValue: present, absent', shapes: ps('ex:p', 'sh:hasValue ex:v'), data: typed('ex:a ex:p ex:v, ex:w . ex:b ex:p ex:w .') },
  { name: 'hasValue: a literal', shapes: ps('ex:p', 'sh:hasValue 5'), data: typed('ex:a ex:p 5 . ex:b ex:p "5" .') },
  // sh:pattern, sh:minLength, sh:maxLength (§4.4)
  { name: 'pattern on literals of several kinds', shapes: ps('ex:p', 'sh:pattern "^[a-z]+$"'), data: typed('ex:a ex:p "abc", "Abc", 12, "x"@en .') },
  { name: 'pattern with flags "i"', shapes: ps('ex:p', 'sh:pattern "^ab" ; sh:flags "i"'), data: typed('ex:a ex:p "ABc", "cab" .') },
  { name: 'pattern on IRIs and blank nodes', shapes: ps('ex:p', 'sh:pattern "example"'), data: typed('ex:a ex:p ex:x, <http://other.test/y>, _:b1 .') },
  { name: 'minLength and maxLength', shapes: ps('ex:p', 'sh:minLength 2 ; sh:maxLength 3'), data: typed('ex:a ex:p "a", "ab", "abcd", 12345, ex:i, _:b1 .') },
  { name: 'maxLength 0', shapes: ps('ex:p', 'sh:maxLength 0'), data: typed('ex:a ex:p "", "x" .') },
  // Value ranges (§4.3)
  { name: 'minInclusive / maxInclusive on integers', shapes: ps('ex:p', 'sh:minInclusive 0 ; sh:maxInclusive 10'), data: typed('ex:a ex:p -1, 0, 10, 11 .') },
  { name: 'minExclusive / maxExclusive on integers', shapes: ps('ex:p', 'sh:minExclusive 0 ; sh:maxExclusive 10'), data: typed('ex:a ex:p 0, 5, 10 .') },
  { name: 'ranges across integer, decimal and double', shapes: ps('ex:p', 'sh:minInclusive 1.5 ; sh:maxExclusive 2.5e0'), data: typed('ex:a ex:p 1, 2, 1.5, 2.5, 2.4e0 .') },
  { name: 'ranges: incomparable values violate', shapes: ps('ex:p', 'sh:minInclusive 0'), data: typed('ex:a ex:p "five", ex:x, true .') },
  { name: 'ranges on dates', shapes: ps('ex:p', 'sh:minInclusive "2020-01-01"^^xsd:date'), data: typed('ex:a ex:p "2019-12-31"^^xsd:date, "2020-01-01"^^xsd:date, "2021-05-05"^^xsd:date .') },
  { name: 'ranges on dateTimes with timezones', shapes: ps('ex:p', 'sh:maxExclusive "2020-01-01T00:00:00Z"^^xsd:dateTime'), data: typed('ex:a ex:p "2020-01-01T01:00:00+02:00"^^xsd:dateTime, "2020-01-01T00:00:00-01:00"^^xsd:dateTime .') },
  // Targets (§2.1.3), severity (§2.1.4), deactivation (§2.1.5)
  { name: 'targetClass includes instances of subclasses', shapes: ps('ex:p', 'sh:minCount 1'), data: 'ex:Sub rdfs:subClassOf ex:C . ex:a a ex:Sub . ex:b a ex:C . ex:c a ex:Other .' },
  { name: 'targetSubjectsOf', shapes: ps('ex:q', 'sh:minCount 1', 'sh:targetSubjectsOf ex:p'), data: 'ex:a ex:p 1 . ex:b ex:p 2 ; ex:q 3 .' },
  { name: 'targetObjectsOf with literal focus nodes', shapes: 'ex:S sh:targetObjectsOf ex:p ; sh:datatype xsd:integer .', data: 'ex:a ex:p 1, "x", ex:y .' },
  { name: 'a property shape with its own target', shapes: 'ex:S a sh:PropertyShape ; sh:targetNode ex:a ; sh:path ex:p ; sh:maxCount 1 .', data: 'ex:a ex:p 1, 2 .' },
  { name: 'implicit class target', shapes: 'ex:C a rdfs:Class, sh:NodeShape ; sh:property [ sh:path ex:p ; sh:minCount 1 ] .', data: 'ex:a a ex:C . ex:b a ex:C ; ex:p 1 .' },
  { name: 'several targets are united', shapes: ps('ex:p', 'sh:minCount 1', 'sh:targetNode ex:n ; sh:targetClass ex:C'), data: 'ex:a a ex:C . ex:n ex:q 1 .' },
  { name: 'severity Warning and Info', shapes: ps('ex:p', 'sh:minCount 1 ; sh:severity sh:Warning') + ps('ex:q', 'sh:minCount 1 ; sh:severity sh:Info').replace('ex:S', 'ex:T'), data: typed('') },
  { name: 'a deactivated property shape', shapes: 'ex:S sh:targetClass ex:C ; sh:property [ sh:path ex:p ; sh:minCount 1 ; sh:deactivated true ] , [ sh:path ex:q ; sh:minCount 1 ] .', data: typed('') },
  { name: 'a deactivated node shape', shapes: 'ex:S sh:targetClass ex:C ; sh:deactivated true ; sh:property [ sh:path ex:p ; sh:minCount 1 ] .', data: typed('') },
];

function key(t: Term): string {
  if (t.termType === 'BlankNode') return '_:blank';
  if (t.termType === 'Literal') return literalKey(t.value, t.datatype.value, t.language || undefined);
  return t.value;
}

type Row = [focus: string, path: string, component: string, value: string, severity: string];

function dataset(text: string): ReturnType<typeof rdf.dataset> {
  const d = rdf.dataset();
  for (const q of new Parser().parse(PREFIXES + text) as Quad[]) d.add(q);
  return d;
}

async function reference(pair: Pair): Promise<Row[]> {
  const shapes = dataset(pair.shapes);
  const validator = new SHACLValidator(shapes, { factory: rdf });
  const report = await validator.validate(dataset(pair.data));
  const severities: Record<string, string> = { [`${SH}Violation`]: 'error', [`${SH}Warning`]: 'warning', [`${SH}Info`]: 'note' };
  return report.results.map((r): Row => {
    let path = '';
    const p = r.path as Term | null | undefined;
    if (p?.termType === 'NamedNode') path = `<${p.value}>`;
    else if (p?.termType === 'BlankNode') {
      const inverse = [...shapes.match(p, rdf.namedNode(`${SH}inversePath`))][0];
      path = inverse ? `^<${inverse.object.value}>` : '?';
    }
    const value = r.value as Term | null | undefined;
    return [key(r.focusNode as Term), path, (r.sourceConstraintComponent as Term).value, value ? key(value) : '', severities[(r.severity as Term).value] ?? '?'];
  });
}

async function plumb(pair: Pair): Promise<Row[]> {
  const data = await turtle(pair.data);
  const shapes = await turtle(pair.shapes, 'shapes.ttl');
  const schema = loadSchema(data, [], [shapes]);
  expect(schema.issues).toEqual([]);
  const blank = (k: unknown): string => (typeof k === 'string' ? (k.startsWith('_:') ? '_:blank' : k) : '');
  return runChecks(data, schema, { only: ['shacl'] }).map((f): Row => [
    blank(f.evidence.focusNode),
    typeof f.evidence.path === 'string' ? f.evidence.path : '',
    String(f.evidence.component),
    blank(f.evidence.value),
    f.severity,
  ]);
}

const sorted = (rows: Row[]): string[] => rows.map((r) => r.join(' | ')).sort();

describe('SHACL: plumb agrees with rdf-validate-shacl', () => {
  it('the battery covers every component of the subset, in at least 30 pairs', () => {
    expect(PAIRS.length).toBeGreaterThanOrEqual(30);
    const text = PAIRS.map((p) => p.shapes).join('\n');
    for (const c of ['class', 'datatype', 'nodeKind', 'minCount', 'maxCount', 'in', 'hasValue', 'pattern', 'flags', 'minInclusive', 'maxInclusive', 'minExclusive', 'maxExclusive', 'minLength', 'maxLength', 'severity', 'deactivated', 'inversePath', 'targetClass', 'targetNode', 'targetSubjectsOf', 'targetObjectsOf']) {
      expect(text, `sh:${c}`).toContain(`sh:${c}`);
    }
  });

  const violations = new Map<string, number>();
  for (const pair of PAIRS) {
    it(pair.name, async () => {
      const [ours, theirs] = await Promise.all([plumb(pair), reference(pair)]);
      expect(sorted(ours)).toEqual(sorted(theirs));
      violations.set(pair.name, theirs.length);
    });
  }

  it('the battery is not trivially empty: nearly every pair has violations', (ctx) => {
    if (violations.size < PAIRS.length) ctx.skip(); // only meaningful after the whole battery ran
    expect([...violations.values()].filter((n) => n > 0).length).toBeGreaterThanOrEqual(PAIRS.length - 2);
  });

  it('known difference: "2020-02-30"^^xsd:date is ill-formed for plumb (XSD 1.1 Part 2 day-of-month constraint) but not for the reference', async () => {
    const pair = { name: 'day of month', shapes: ps('ex:p', 'sh:datatype xsd:date'), data: typed('ex:a ex:p "2020-02-30"^^xsd:date .') };
    expect((await plumb(pair)).map((r) => r[2])).toEqual([`${SH}DatatypeConstraintComponent`]);
    expect(await reference(pair)).toEqual([]);
  });
});

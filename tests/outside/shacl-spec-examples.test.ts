/**
 * The examples of the W3C Shapes Constraint Language (SHACL) Recommendation, 20 July 2017, for each
 * component plumb supports: the shapes graph, the data graph and the validation results the text
 * gives for them. The examples are reproduced from memory of the Recommendation (section numbers as
 * in the 2017 text); the expected results are the ones the Recommendation states beside each.
 */
import { describe, expect, it } from 'vitest';
import { runChecks } from '../../src/checks/index.js';
import { loadSchema } from '../../src/schema/index.js';
import { EX, turtle } from '../checks/helpers.js';

const SH = 'http://www.w3.org/ns/shacl#';

async function validate(shapes: string, data: string): Promise<{ results: Array<{ focus: string; component: string; value?: string }>; issues: string[] }> {
  const graph = await turtle(data);
  const schema = loadSchema(graph, [], [await turtle(shapes, 'shapes.ttl')]);
  const results = runChecks(graph, schema, { only: ['shacl'] }).map((f) => ({
    focus: String(f.evidence.focusNode).replace(EX, 'ex:'),
    component: String(f.evidence.component).replace(SH, 'sh:'),
    ...(typeof f.evidence.value === 'string' ? { value: f.evidence.value.replace(EX, 'ex:') } : {}),
  }));
  return { results, issues: schema.issues.map((i) => i.message) };
}

describe('W3C SHACL Recommendation examples', () => {
  it('§1.4 the introductory example: three of its four results; sh:closed named as outside the subset', async () => {
    // Source: W3C SHACL §1.4 (Example shapes graph / data graph / validation report). The fourth
    // result there comes from sh:closed, which plumb does not evaluate and says so.
    const { results, issues } = await validate(
      `
ex:PersonShape
  a sh:NodeShape ;
  sh:targetClass ex:Person ;
  sh:property [
    sh:path ex:ssn ;
    sh:maxCount 1 ;
    sh:datatype xsd:string ;
    sh:pattern "^\\\\d{3}-\\\\d{2}-\\\\d{4}$" ;
  ] ;
  sh:property [
    sh:path ex:worksFor ;
    sh:class ex:Company ;
    sh:nodeKind sh:IRI ;
  ] ;
  sh:closed true ;
  sh:ignoredProperties ( rdf:type ) .`,
      `
ex:Alice a ex:Person ; ex:ssn "987-65-432A" .
ex:Bob a ex:Person ; ex:ssn "123-45-6789" ; ex:ssn "124-35-6789" .
ex:Calvin a ex:Person ; ex:birthDate "1971-07-07"^^xsd:date ; ex:worksFor ex:UntypedCompany .`,
    );
    expect(results).toEqual([
      { focus: 'ex:Alice', component: 'sh:PatternConstraintComponent', value: '"987-65-432A"' },
      { focus: 'ex:Bob', component: 'sh:MaxCountConstraintComponent' },
      { focus: 'ex:Calvin', component: 'sh:ClassConstraintComponent', value: 'ex:UntypedCompany' },
    ]);
    expect(issues.join('\n')).toMatch(/sh:closed is outside/);
    expect(issues.join('\n')).toMatch(/sh:ignoredProperties is outside/);
  });

  it('§2.1.3.2 sh:targetClass: instances, including those of subclasses', async () => {
    // Source: W3C SHACL §2.1.3.2 — ex:Alice (Person), ex:Bob (Doctor ⊑ Person) are focus nodes; ex:NewYork is not.
    const { results } = await validate(
      `\nex:PersonShape a sh:NodeShape ; sh:targetClass ex:Person ; sh:property [ sh:path ex:name ; sh:minCount 1 ] .`,
      `\nex:Alice a ex:Person .\nex:Bob a ex:Doctor .\nex:Doctor rdfs:subClassOf ex:Person .\nex:NewYork a ex:Place .`,
    );
    expect(results.map((r) => r.focus)).toEqual(['ex:Alice', 'ex:Bob']);
  });

  it('§4.1.1 sh:class: Carol\'s address is not a PostalAddress', async () => {
    // Source: W3C SHACL §4.1.1 (ex:ClassExampleShape): one violation, focus ex:Carol.
    const { results } = await validate(
      `\nex:ClassExampleShape a sh:NodeShape ; sh:targetNode ex:Alice, ex:Bob, ex:Carol ;\n  sh:property [ sh:path ex:address ; sh:class ex:PostalAddress ] .`,
      `\nex:Alice a ex:Person .\nex:Bob ex:address [ a ex:PostalAddress ; ex:city ex:Berlin ] .\nex:Carol ex:address [ ex:city ex:Cairo ] .`,
    );
    expect(results.map((r) => [r.focus, r.component])).toEqual([['ex:Carol', 'sh:ClassConstraintComponent']]);
  });

  it('§4.1.2 sh:datatype: a plain string and an xsd:int where xsd:integer is required', async () => {
    // Source: W3C SHACL §4.1.2 (ex:DatatypeExampleShape): violations for ex:Bob and ex:Carol.
    const { results } = await validate(
      `\nex:DatatypeExampleShape a sh:NodeShape ; sh:targetNode ex:Alice, ex:Bob, ex:Carol ;\n  sh:property [ sh:path ex:age ; sh:datatype xsd:integer ] .`,
      `\nex:Alice ex:age "23"^^xsd:integer .\nex:Bob ex:age "twenty two" .\nex:Carol ex:age "23"^^xsd:int .`,
    );
    expect(results.map((r) => r.focus)).toEqual(['ex:Bob', 'ex:Carol']);
  });

  it('§4.1.3 sh:nodeKind: a literal where an IRI is required', async () => {
    // Source: W3C SHACL §4.1.3 (ex:NodeKindExampleShape, sh:targetObjectsOf ex:knows): one violation, "Bob".
    const { results } = await validate(
      `\nex:NodeKindExampleShape a sh:NodeShape ; sh:targetObjectsOf ex:knows ; sh:nodeKind sh:IRI .`,
      `\nex:Bob ex:knows ex:Alice .\nex:Alice ex:knows "Bob" .`,
    );
    expect(results).toEqual([{ focus: '"Bob"', component: 'sh:NodeKindConstraintComponent', value: '"Bob"' }]);
  });

  it('§4.2.1 sh:minCount: Bob has no ex:name', async () => {
    // Source: W3C SHACL §4.2.1 (ex:MinCountExampleShape): one violation, focus ex:Bob.
    const { results } = await validate(
      `\nex:MinCountExampleShape a sh:PropertyShape ; sh:targetNode ex:Alice, ex:Bob ; sh:path ex:name ; sh:minCount 1 .`,
      `\nex:Alice ex:name "Alice" .\nex:Bob ex:givenName "Bob"@en .`,
    );
    expect(results).toEqual([{ focus: 'ex:Bob', component: 'sh:MinCountConstraintComponent' }]);
  });

  it('§4.2.2 sh:maxCount: one birth date conforms', async () => {
    // Source: W3C SHACL §4.2.2 (ex:MaxCountExampleShape): the data conforms.
    const { results } = await validate(
      `\nex:MaxCountExampleShape a sh:NodeShape ; sh:targetNode ex:Bob ; sh:property [ sh:path ex:birthDate ; sh:maxCount 1 ] .`,
      `\nex:Bob ex:birthDate "May 5th 1990" .`,
    );
    expect(results).toEqual([]);
  });

  it('§4.3 value ranges: an age of 220 and an age that is not a number', async () => {
    // Source: W3C SHACL §4.3.3 (ex:NumericRangeExampleShape, sh:minInclusive 0, sh:maxInclusive 150):
    // violations for ex:Alice (220) and ex:Ted ("twenty one" is not comparable).
    const { results } = await validate(
      `\nex:NumericRangeExampleShape a sh:NodeShape ; sh:targetNode ex:Bob, ex:Alice, ex:Ted ;\n  sh:property [ sh:path ex:age ; sh:minInclusive 0 ; sh:maxInclusive 150 ] .`,
      `\nex:Bob ex:age 23 .\nex:Alice ex:age 220 .\nex:Ted ex:age "twenty one" .`,
    );
    expect(results.map((r) => [r.focus, r.component]).sort()).toEqual([
      ['ex:Alice', 'sh:MaxInclusiveConstraintComponent'],
      ['ex:Ted', 'sh:MaxInclusiveConstraintComponent'],
      ['ex:Ted', 'sh:MinInclusiveConstraintComponent'],
    ]);
  });

  it('§4.3.1/§4.3.2 exclusive bounds: the bound itself is outside', async () => {
    // Source: W3C SHACL §4.3.1, §4.3.2 (definitions: value < or > the bound); values of our own.
    const { results } = await validate(
      `\nex:S sh:targetNode ex:a ; sh:property [ sh:path ex:v ; sh:minExclusive 0 ; sh:maxExclusive 10 ] .`,
      `\nex:a ex:v 0, 5, 10 .`,
    );
    expect(results.map((r) => [r.value, r.component])).toEqual([
      ['"0"^^<http://www.w3.org/2001/XMLSchema#integer>', 'sh:MinExclusiveConstraintComponent'],
      ['"10"^^<http://www.w3.org/2001/XMLSchema#integer>', 'sh:MaxExclusiveConstraintComponent'],
    ]);
  });

  it('§4.4.1/§4.4.2 sh:minLength, sh:maxLength: a password of 13 characters', async () => {
    // Source: W3C SHACL §4.4.1 (ex:PasswordExampleShape, lengths 8 to 10): one violation, ex:Alice.
    const { results } = await validate(
      `\nex:PasswordExampleShape a sh:NodeShape ; sh:targetNode ex:Bob, ex:Alice ;\n  sh:property [ sh:path ex:password ; sh:minLength 8 ; sh:maxLength 10 ] .`,
      `\nex:Bob ex:password "123456789" .\nex:Alice ex:password "1234567890ABC" .`,
    );
    expect(results.map((r) => [r.focus, r.component])).toEqual([['ex:Alice', 'sh:MaxLengthConstraintComponent']]);
  });

  it('§4.4.3 sh:pattern with sh:flags "i": a code that does not start with B', async () => {
    // Source: W3C SHACL §4.4.3 (ex:PatternExampleShape, "^B" ignoring case): one violation, ex:Carol.
    const { results } = await validate(
      `\nex:PatternExampleShape a sh:NodeShape ; sh:targetNode ex:Bob, ex:Alice, ex:Carol ;\n  sh:property [ sh:path ex:bCode ; sh:pattern "^B" ; sh:flags "i" ] .`,
      `\nex:Bob ex:bCode "b101" .\nex:Alice ex:bCode "B102" .\nex:Carol ex:bCode "C103" .`,
    );
    expect(results).toEqual([{ focus: 'ex:Carol', component: 'sh:PatternConstraintComponent', value: '"C103"' }]);
  });

  it('§4.8.1 sh:in: a yellow pony', async () => {
    // Source: W3C SHACL §4.8.1 (ex:InExampleShape, colours ex:Pink ex:Purple): one violation, value ex:Yellow.
    const { results } = await validate(
      `\nex:InExampleShape a sh:NodeShape ; sh:targetNode ex:RainbowPony ;\n  sh:property [ sh:path ex:color ; sh:in ( ex:Pink ex:Purple ) ] .`,
      `\nex:RainbowPony ex:color ex:Yellow .`,
    );
    expect(results).toEqual([{ focus: 'ex:RainbowPony', component: 'sh:InConstraintComponent', value: 'ex:Yellow' }]);
  });

  it('§4.8.2 sh:hasValue: one of two values is the required one', async () => {
    // Source: W3C SHACL §4.8.2 (ex:StanfordGraduate): the data conforms.
    const shapes = `\nex:StanfordGraduate a sh:NodeShape ; sh:targetNode ex:Alice ;\n  sh:property [ sh:path ex:alumniOf ; sh:hasValue ex:Stanford ] .`;
    expect((await validate(shapes, `\nex:Alice ex:alumniOf ex:Harvard .\nex:Alice ex:alumniOf ex:Stanford .`)).results).toEqual([]);
    // And without ex:Stanford, a violation (the definition in the same section).
    expect((await validate(shapes, `\nex:Alice ex:alumniOf ex:Harvard .`)).results).toEqual([{ focus: 'ex:Alice', component: 'sh:HasValueConstraintComponent' }]);
  });

  it('§2.3.1.3 inverse paths: the values are the subjects pointing at the focus node', async () => {
    // Source: W3C SHACL §2.3.1.3 (sh:inversePath ex:parent: the children of the focus node); data our own.
    const { results } = await validate(
      `\nex:S a sh:PropertyShape ; sh:targetNode ex:Dad ; sh:path [ sh:inversePath ex:parent ] ; sh:minCount 3 .`,
      `\nex:Kid1 ex:parent ex:Dad .\nex:Kid2 ex:parent ex:Dad .`,
    );
    expect(results).toEqual([{ focus: 'ex:Dad', component: 'sh:MinCountConstraintComponent' }]);
  });
});

import { describe, expect, it } from 'vitest';
import { findingsOf, runCases } from './helpers.js';

const SH = 'http://www.w3.org/ns/shacl#';

const PEOPLE = `
ex:PersonShape a sh:NodeShape ;
  sh:targetClass ex:Person ;
  sh:property [ sh:path ex:name ; sh:minCount 1 ; sh:maxCount 1 ; sh:datatype xsd:string ] ;
  sh:property [ sh:path ex:age ; sh:datatype xsd:integer ; sh:minInclusive 0 ; sh:maxExclusive 150 ] ;
  sh:property [ sh:path ex:email ; sh:pattern "^[^@ ]+@[^@ ]+$" ; sh:nodeKind sh:Literal ] ;
  sh:property [ sh:path ex:employer ; sh:class ex:Org ] ;
  sh:property [ sh:path ex:status ; sh:in ( "active" "retired" ) ] ;
  sh:property [ sh:path ex:code ; sh:minLength 2 ; sh:maxLength 4 ] .
`;

describe('shacl', () => {
  runCases('shacl', {
    valid: [
      {
        name: 'a conforming person',
        shapes: PEOPLE,
        data: `\nex:ann a ex:Person ; ex:name "Ann" ; ex:age 40 ; ex:email "ann@example.org" ; ex:employer ex:acme ; ex:status "active" ; ex:code "AB1" .\nex:acme a ex:Org .`,
      },
      { name: 'nodes not targeted are not validated', shapes: PEOPLE, data: `\nex:rock ex:age "old" .` },
      {
        name: 'a deactivated shape is skipped (§2.1.5)',
        shapes: `\nex:S a sh:NodeShape ; sh:targetNode ex:a ; sh:deactivated true ; sh:property [ sh:path ex:p ; sh:minCount 1 ] .`,
        data: `\nex:a ex:q 1 .`,
      },
      {
        name: 'sh:class is satisfied through rdfs:subClassOf in the data (SHACL instance, §1.5)',
        shapes: `\nex:S sh:targetNode ex:a ; sh:property [ sh:path ex:employer ; sh:class ex:Org ] .`,
        data: `\nex:Company rdfs:subClassOf ex:Org .\nex:a ex:employer ex:c .\nex:c a ex:Company .`,
      },
    ],
    invalid: [
      {
        name: 'minCount: the finding is about the focus node, with the path as predicate and no object',
        shapes: PEOPLE,
        data: `\nex:bob a ex:Person .`,
        expect: [{ severity: 'error', subject: 'ex:bob', predicate: 'ex:name', object: '', line: 2, evidence: { component: `${SH}MinCountConstraintComponent`, focusNode: 'http://example.org/bob', path: '<http://example.org/name>', count: 0 } }],
      },
      {
        name: 'maxCount points at the first value over the limit',
        shapes: PEOPLE,
        data: `\nex:bob a ex:Person ; ex:name "Bob" .\nex:bob ex:name "Robert" .`,
        expect: [{ subject: 'ex:bob', predicate: 'ex:name', object: '', line: 3, evidence: { component: `${SH}MaxCountConstraintComponent`, count: 2 } }],
      },
      {
        name: 'value components report the value triple',
        shapes: PEOPLE,
        data:
          `\nex:bob a ex:Person ; ex:name "Bob" .\nex:bob ex:age 200 .\nex:bob ex:age "x"^^xsd:integer .\nex:bob ex:email "bob at example" .` +
          `\nex:bob ex:employer ex:nobody .\nex:bob ex:status "gone" .\nex:bob ex:code "A" .\nex:bob ex:email ex:mailbox .`,
        expect: [
          { object: '"200"^^<http://www.w3.org/2001/XMLSchema#integer>', line: 3, evidence: { component: `${SH}MaxExclusiveConstraintComponent` } },
          { line: 4, evidence: { component: `${SH}DatatypeConstraintComponent` } },
          { line: 4, evidence: { component: `${SH}MinInclusiveConstraintComponent` } },
          { line: 4, evidence: { component: `${SH}MaxExclusiveConstraintComponent` } },
          { line: 5, evidence: { component: `${SH}PatternConstraintComponent` } },
          { object: 'ex:nobody', line: 6, evidence: { component: `${SH}ClassConstraintComponent`, value: 'http://example.org/nobody' } },
          { line: 7, evidence: { component: `${SH}InConstraintComponent` } },
          { line: 8, evidence: { component: `${SH}MinLengthConstraintComponent` } },
          { line: 9, evidence: { component: `${SH}NodeKindConstraintComponent` } },
          { line: 9, evidence: { component: `${SH}PatternConstraintComponent` } },
        ],
      },
      {
        name: 'sh:severity and sh:message',
        shapes: `\nex:S sh:targetNode ex:a ; sh:property [ sh:path ex:p ; sh:minCount 1 ; sh:severity sh:Warning ; sh:message "needs a p"@en ] .`,
        data: `\nex:a ex:q 1 .`,
        expect: [{ severity: 'warning', message: /^needs a p$/ }],
      },
      {
        name: 'sh:Info is a note',
        shapes: `\nex:S sh:targetNode ex:a ; sh:severity sh:Info ; sh:class ex:Thing .`,
        data: `\nex:a ex:q 1 .`,
        expect: [{ severity: 'note', subject: 'ex:a', predicate: '', object: '' }],
      },
      {
        name: 'inverse path: the value triple is (value, p, focus)',
        shapes: `\nex:S sh:targetNode ex:acme ; sh:property [ sh:path [ sh:inversePath ex:employer ] ; sh:class ex:Person ; sh:maxCount 1 ] .`,
        data: `\nex:ann ex:employer ex:acme .\nex:bob ex:employer ex:acme .\nex:ann a ex:Person .`,
        expect: [
          { subject: 'ex:bob', object: 'ex:acme', line: 3, evidence: { path: '^<http://example.org/employer>', value: 'http://example.org/bob' } },
          { subject: 'ex:acme', predicate: 'ex:employer', object: '', evidence: { component: `${SH}MaxCountConstraintComponent` } },
        ],
      },
      {
        name: 'targetSubjectsOf and targetObjectsOf',
        shapes: `\nex:S sh:targetSubjectsOf ex:knows ; sh:nodeKind sh:IRI .\nex:T sh:targetObjectsOf ex:knows ; sh:nodeKind sh:IRI .`,
        data: `\n_:b ex:knows "lit" .`,
        expect: [
          { evidence: { component: `${SH}NodeKindConstraintComponent`, shape: 'http://example.org/S' } },
          { evidence: { component: `${SH}NodeKindConstraintComponent`, shape: 'http://example.org/T', focusNode: '"lit"' } },
        ],
      },
      {
        name: 'a targetNode missing from the data still has its minCount checked',
        shapes: `\nex:S sh:targetNode ex:ghost ; sh:property [ sh:path ex:p ; sh:minCount 1 ] .`,
        data: `\nex:a ex:q 1 .`,
        expect: [{ subject: 'ex:ghost', predicate: 'ex:p', object: '' }],
      },
      {
        name: 'sh:hasValue',
        shapes: `\nex:S sh:targetNode ex:a ; sh:property [ sh:path ex:color ; sh:hasValue ex:Red ] .`,
        data: `\nex:a ex:color ex:Blue .`,
        expect: [{ subject: 'ex:a', predicate: 'ex:color', object: '', line: 2, evidence: { component: `${SH}HasValueConstraintComponent` } }],
      },
      {
        name: 'sh:pattern with sh:flags "i"',
        shapes: `\nex:S sh:targetNode ex:a ; sh:property [ sh:path ex:code ; sh:pattern "^ab$" ; sh:flags "i" ] .`,
        data: `\nex:a ex:code "AB", "ABC" .`,
        expect: [{ object: '"ABC"' }],
      },
      {
        name: 'implicit class target: a shape that is also a class (§2.1.3.3)',
        shapes: `\nex:Person a rdfs:Class, sh:NodeShape ; sh:property [ sh:path ex:name ; sh:minCount 1 ] .`,
        data: `\nex:z a ex:Person .`,
        expect: [{ subject: 'ex:z' }],
      },
    ],
  });

  it('a shapes file with an invalid regular expression still evaluates its other constraints', async () => {
    const found = await findingsOf('shacl', {
      shapes: `\nex:S sh:targetNode ex:a ; sh:property [ sh:path ex:p ; sh:pattern "(" ; sh:minCount 2 ] .`,
      data: `\nex:a ex:p "x" .`,
    });
    expect(found.map((f) => f.evidence.component)).toEqual([`${SH}MinCountConstraintComponent`]);
  });
});

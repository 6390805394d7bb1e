import { describe } from 'vitest';
import { runCases } from './helpers.js';

describe('schema', () => {
  runCases('schema', {
    valid: [
      { name: 'a clean ontology', data: `\nex:A rdfs:subClassOf ex:B .\nex:B rdfs:subClassOf ex:C .` },
      { name: 'owl:equivalentClass is not reported as a cycle', data: `\nex:A owl:equivalentClass ex:B .` },
      { name: 'a class that is its own subclass is trivially true (rdfs10)', data: `\nex:A rdfs:subClassOf ex:A .` },
      { name: 'non-validating SHACL properties are understood', shapes: `\nex:S a sh:NodeShape ; sh:targetNode ex:a ; sh:name "S" ; sh:description "d" ; sh:property [ sh:path ex:p ; sh:order 1 ; sh:group ex:G ; sh:minCount 0 ] .` , data: `\nex:a ex:p 1 .` },
    ],
    invalid: [
      {
        name: 'a subclass cycle: a warning naming the classes and the line',
        data: `\nex:A rdfs:subClassOf ex:B .\nex:B rdfs:subClassOf ex:C .\nex:C rdfs:subClassOf ex:A .`,
        expect: [{ severity: 'warning', predicate: 'http://www.w3.org/2000/01/rdf-schema#subClassOf', message: /cycle through <http:\/\/example.org\/A>, <http:\/\/example.org\/B>, <http:\/\/example.org\/C>/, evidence: { code: 'subclass-cycle' } }],
      },
      {
        name: 'a sub-property cycle in a --schema file',
        schema: `\nex:p rdfs:subPropertyOf ex:q .\nex:q rdfs:subPropertyOf ex:p .`,
        data: `\nex:a ex:p ex:b .`,
        expect: [{ evidence: { code: 'subproperty-cycle' } }],
      },
      {
        name: 'unsupported SHACL is named with its line',
        shapes: `\nex:S a sh:NodeShape ; sh:targetClass ex:A ;\n  sh:closed true ;\n  sh:or ( ex:X ex:Y ) .`,
        data: `\nex:a a ex:A .`,
        expect: [
          { severity: 'warning', predicate: 'http://www.w3.org/ns/shacl#closed', line: 3, message: /sh:closed is outside/ },
          { severity: 'warning', predicate: 'http://www.w3.org/ns/shacl#or', line: 4, message: /sh:or is outside/ },
        ],
      },
      {
        name: 'a malformed path: an error with the line',
        shapes: `\nex:S sh:targetNode ex:a ;\n  sh:property [ sh:path "name" ; sh:minCount 1 ] .`,
        data: `\nex:a ex:p 1 .`,
        expect: [{ severity: 'error', line: 3, message: /sh:path must be an IRI or a blank node path/, evidence: { code: 'malformed-shape' } }],
      },
      {
        name: 'a blank-node path with no path property',
        shapes: `\nex:S sh:targetNode ex:a ;\n  sh:property [ sh:path [ ex:foo ex:bar ] ; sh:minCount 1 ] .`,
        data: `\nex:a ex:p 1 .`,
        expect: [{ severity: 'error', line: 3, message: /malformed sh:path/ }],
      },
      {
        name: 'an alternative path is named as unsupported',
        shapes: `\nex:S sh:targetNode ex:a ;\n  sh:property [ sh:path [ sh:alternativePath ( ex:p ex:q ) ] ; sh:minCount 1 ] .`,
        data: `\nex:a ex:p 1 .`,
        expect: [{ severity: 'warning', line: 3, message: /sh:alternativePath/ }],
      },
      {
        name: 'an invalid sh:pattern: an error with the line',
        shapes: `\nex:S sh:targetNode ex:a ;\n  sh:property [ sh:path ex:p ;\n    sh:pattern "[a-" ] .`,
        data: `\nex:a ex:p "x" .`,
        expect: [{ severity: 'error', line: 4, message: /not a valid regular expression/, evidence: { code: 'invalid-pattern' } }],
      },
      {
        name: 'an unknown sh:flags letter',
        shapes: `\nex:S sh:targetNode ex:a ; sh:property [ sh:path ex:p ; sh:pattern "a" ; sh:flags "g" ] .`,
        data: `\nex:a ex:p "x" .`,
        expect: [{ severity: 'error', message: /unknown flag "g"/ }],
      },
      {
        name: 'minCount on a node shape',
        shapes: `\nex:S sh:targetNode ex:a ; sh:minCount 1 .`,
        data: `\nex:a ex:p 1 .`,
        expect: [{ severity: 'error', message: /property shapes only/ }],
      },
      {
        name: 'a property shape without a path',
        shapes: `\nex:S sh:targetNode ex:a ;\n  sh:property ex:P .\nex:P sh:minCount 1 .`,
        data: `\nex:a ex:p 1 .`,
        expect: [{ severity: 'error', line: 3, message: /has no sh:path/ }],
      },
      {
        name: 'owl:AllDisjointClasses without a proper list',
        data: `\n[] a owl:AllDisjointClasses ; owl:members ex:notAList .`,
        expect: [{ severity: 'error', line: 2, evidence: { code: 'malformed-axiom' } }],
      },
      {
        name: 'an rdfs:domain that is a literal',
        data: `\nex:p rdfs:domain "Person" .`,
        expect: [{ severity: 'error', line: 2, evidence: { code: 'malformed-axiom' } }],
      },
    ],
  });
});

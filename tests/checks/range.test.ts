import { describe } from 'vitest';
import { atLine, runCases } from './helpers.js';

const ONTOLOGY = `
ex:employs rdfs:range ex:Person .
ex:Employee rdfs:subClassOf ex:Person .
ex:Person owl:disjointWith ex:Place .
ex:age rdfs:range xsd:decimal .
ex:name rdfs:range rdfs:Literal .
ex:title rdfs:range xsd:string .
`;

describe('range', () => {
  runCases('range', {
    valid: [
      { name: 'object has the range class', data: `${ONTOLOGY}ex:o ex:employs ex:a . ex:a a ex:Person .` },
      { name: 'object has a subclass of the range', data: `${ONTOLOGY}ex:o ex:employs ex:a . ex:a a ex:Employee .` },
      { name: 'xsd:integer is derived from the xsd:decimal range (XSD 1.1 Part 2 §3.4.13)', data: `${ONTOLOGY}ex:a ex:age 42 .` },
      { name: 'xsd:decimal literal for xsd:decimal range', data: `${ONTOLOGY}ex:a ex:age 4.2 .` },
      { name: 'any literal for rdfs:Literal', data: `${ONTOLOGY}ex:a ex:name "Ann"@en, 3, "x" .` },
      { name: 'a literal for a class range is left to literal-where-resource', data: `${ONTOLOGY}ex:o ex:employs "Ann" .` },
      { name: 'a resource for a datatype range is left to resource-where-literal', data: `${ONTOLOGY}ex:a ex:age ex:b .` },
    ],
    invalid: [
      {
        name: 'untyped object: missing type warning',
        data: `${ONTOLOGY}ex:o ex:employs ex:a .`,
        expect: [{ severity: 'warning', subject: 'ex:o', object: 'ex:a', line: 8, message: /object of .*has no rdf:type/ }],
      },
      {
        name: 'object typed disjoint with the range: error',
        data: `${ONTOLOGY}ex:o ex:employs ex:rome .\nex:rome a ex:Place .`,
        expect: [{ severity: 'error', object: 'ex:rome', line: 8, evidence: { conflicts: [{ type: 'http://example.org/Place', declaredAt: atLine(4) }] } }],
      },
      {
        name: 'literal datatype outside a datatype range: error',
        data: `${ONTOLOGY}ex:a ex:age "old" .`,
        expect: [{ severity: 'error', line: 8, message: /datatype xsd:string, but its range is xsd:decimal/, evidence: { actual: 'http://www.w3.org/2001/XMLSchema#string', expected: ['http://www.w3.org/2001/XMLSchema#decimal'], declaredAt: atLine(5) } }],
      },
      {
        name: 'xsd:double is not derived from xsd:decimal',
        data: `${ONTOLOGY}ex:a ex:age 4.2e1 .`,
        expect: [{ severity: 'error' }],
      },
      {
        name: 'a language-tagged string is not an xsd:string (RDF 1.1 Concepts §3.3)',
        data: `${ONTOLOGY}ex:a ex:title "Dr"@en .`,
        expect: [{ severity: 'error', message: /rdf:langString/ }],
      },
    ],
  });
});

import { describe } from 'vitest';
import { atLine, runCases } from './helpers.js';

const ONTOLOGY = `
ex:Person owl:disjointWith ex:Organization .
ex:Employee rdfs:subClassOf ex:Person .
[] a owl:AllDisjointClasses ; owl:members ( ex:Cat ex:Dog ex:Fish ) .
`;

describe('disjoint-classes', () => {
  runCases('disjoint-classes', {
    valid: [
      { name: 'one class', data: `${ONTOLOGY}ex:a a ex:Employee .` },
      { name: 'two classes not declared disjoint', data: `${ONTOLOGY}ex:a a ex:Person, ex:Cat .` },
      { name: 'no disjointness axioms at all', data: `\nex:a a ex:Person, ex:Organization .` },
    ],
    invalid: [
      {
        name: 'both classes of an owl:disjointWith',
        data: `${ONTOLOGY}ex:a a ex:Person .\nex:a a ex:Organization .`,
        expect: [{ severity: 'error', subject: 'ex:a', predicate: 'http://www.w3.org/1999/02/22-rdf-syntax-ns#type', object: 'ex:Organization', line: 6, evidence: { classes: ['http://example.org/Person', 'http://example.org/Organization'], declaredAt: atLine(2) } }],
      },
      {
        name: 'through a subclass (the type closure)',
        data: `${ONTOLOGY}ex:a a ex:Organization .\nex:a a ex:Employee .`,
        expect: [{ severity: 'error', subject: 'ex:a', object: 'ex:Employee', line: 6 }],
      },
      {
        name: 'two members of owl:AllDisjointClasses (OWL 2 §9.1.3)',
        data: `${ONTOLOGY}ex:rex a ex:Dog, ex:Fish .`,
        expect: [{ severity: 'error', subject: 'ex:rex', message: /Dog.*Fish/, evidence: { declaredAt: atLine(4) } }],
      },
      {
        name: 'three members: one finding per disjoint pair',
        data: `${ONTOLOGY}ex:x a ex:Cat, ex:Dog, ex:Fish .`,
        expect: [{ subject: 'ex:x' }, { subject: 'ex:x' }, { subject: 'ex:x' }],
      },
      {
        name: 'axioms from a --schema file',
        schema: ONTOLOGY,
        data: `\nex:a a ex:Person, ex:Organization .`,
        expect: [{ severity: 'error', line: 2, evidence: { declaredAt: atLine(2, 'schema.ttl') } }],
      },
    ],
  });
});

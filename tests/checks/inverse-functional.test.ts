import { describe } from 'vitest';
import { runCases } from './helpers.js';

const ONTOLOGY = `
ex:email a owl:InverseFunctionalProperty .
ex:workEmail rdfs:subPropertyOf ex:email .
`;

describe('inverse-functional', () => {
  runCases('inverse-functional', {
    valid: [
      { name: 'each value has one subject', data: `${ONTOLOGY}ex:a ex:email "a@example.org" . ex:b ex:email "b@example.org" .` },
      { name: 'one subject with two values is fine', data: `${ONTOLOGY}ex:a ex:email "a@example.org", "a2@example.org" .` },
    ],
    invalid: [
      {
        name: 'two subjects share a value: OWL infers they are the same, a warning',
        data: `${ONTOLOGY}ex:a ex:email "x@example.org" .\nex:b ex:email "x@example.org" .`,
        expect: [{ severity: 'warning', subject: '', predicate: 'ex:email', object: '"x@example.org"', line: 5, evidence: { values: 2, sample: ['http://example.org/a', 'http://example.org/b'] } }],
      },
      {
        name: 'through a sub-property',
        data: `${ONTOLOGY}ex:a ex:email "x@example.org" .\nex:b ex:workEmail "x@example.org" .`,
        expect: [{ severity: 'warning', line: 5 }],
      },
      {
        name: 'closed world: error',
        data: `${ONTOLOGY}ex:a ex:email "x@example.org" . ex:b ex:email "x@example.org" .`,
        options: { closedWorld: true },
        expect: [{ severity: 'error' }],
      },
    ],
  });
});

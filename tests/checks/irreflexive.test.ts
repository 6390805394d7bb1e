import { describe } from 'vitest';
import { runCases } from './helpers.js';

const ONTOLOGY = `
ex:parentOf a owl:IrreflexiveProperty .
ex:motherOf rdfs:subPropertyOf ex:parentOf .
`;

describe('irreflexive', () => {
  runCases('irreflexive', {
    valid: [
      { name: 'different subject and object', data: `${ONTOLOGY}ex:a ex:parentOf ex:b .` },
      { name: 'a reflexive triple of a property not declared irreflexive', data: `${ONTOLOGY}ex:a ex:knows ex:a .` },
    ],
    invalid: [
      { name: 'an entity related to itself', data: `${ONTOLOGY}ex:a ex:parentOf ex:a .`, expect: [{ severity: 'error', subject: 'ex:a', object: 'ex:a', line: 4 }] },
      { name: 'through a sub-property', data: `${ONTOLOGY}ex:a ex:motherOf ex:a .`, expect: [{ severity: 'error', predicate: 'ex:motherOf', evidence: { property: 'http://example.org/parentOf' } }] },
    ],
  });
});

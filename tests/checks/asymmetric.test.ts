import { describe } from 'vitest';
import { runCases } from './helpers.js';

const ONTOLOGY = `
ex:parentOf a owl:AsymmetricProperty .
ex:motherOf rdfs:subPropertyOf ex:parentOf .
`;

describe('asymmetric', () => {
  runCases('asymmetric', {
    valid: [
      { name: 'one direction only', data: `${ONTOLOGY}ex:a ex:parentOf ex:b . ex:b ex:parentOf ex:c .` },
      { name: 'both ways on a property not declared asymmetric', data: `${ONTOLOGY}ex:a ex:knows ex:b . ex:b ex:knows ex:a .` },
    ],
    invalid: [
      {
        name: 'both directions: one finding on the earlier triple',
        data: `${ONTOLOGY}ex:a ex:parentOf ex:b .\nex:b ex:parentOf ex:a .`,
        expect: [{ severity: 'error', subject: 'ex:a', object: 'ex:b', line: 4, evidence: { reverseSource: expectLine(5) } }],
      },
      {
        name: 'both directions through sub-properties',
        data: `${ONTOLOGY}ex:a ex:motherOf ex:b .\nex:b ex:parentOf ex:a .`,
        expect: [{ severity: 'error', line: 4 }],
      },
      { name: 'reflexive (asymmetry implies irreflexivity)', data: `${ONTOLOGY}ex:a ex:parentOf ex:a .`, expect: [{ severity: 'error', message: /itself/ }] },
    ],
  });
});

function expectLine(line: number): unknown {
  return { asymmetricMatch: (v: unknown) => typeof v === 'string' && v.endsWith(`:${line}`) };
}

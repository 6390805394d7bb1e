import { describe, expect, it } from 'vitest';
import { findingsOf, runCases } from './helpers.js';

const ONTOLOGY = `
ex:birthDate a owl:FunctionalProperty .
ex:mother a owl:FunctionalProperty .
ex:biologicalMother rdfs:subPropertyOf ex:mother .
`;

describe('functional', () => {
  runCases('functional', {
    valid: [
      { name: 'one value', data: `${ONTOLOGY}ex:a ex:birthDate "2000-01-01"^^xsd:date ; ex:mother ex:m .` },
      { name: 'the same value twice in two spellings is one value', data: `${ONTOLOGY}ex:a ex:birthDate 1, "01"^^xsd:integer .` },
      { name: 'a sub-property stating the same value', data: `${ONTOLOGY}ex:a ex:mother ex:m ; ex:biologicalMother ex:m .` },
      { name: 'different subjects, one value each', data: `${ONTOLOGY}ex:a ex:mother ex:m . ex:b ex:mother ex:n .` },
    ],
    invalid: [
      {
        name: 'two different literals: error',
        data: `${ONTOLOGY}ex:a ex:birthDate "2000-01-01"^^xsd:date .\nex:a ex:birthDate "2001-01-01"^^xsd:date .`,
        expect: [{ severity: 'error', subject: 'ex:a', predicate: 'ex:birthDate', object: '', line: 6, evidence: { values: 2 } }],
      },
      {
        name: 'two different resources: OWL infers sameAs, so a warning',
        data: `${ONTOLOGY}ex:a ex:mother ex:m .\nex:a ex:mother ex:n .`,
        expect: [{ severity: 'warning', subject: 'ex:a', line: 6, message: /same individual/, evidence: { openWorld: true } }],
      },
      {
        name: 'closed world (unique names): two resources are an error',
        data: `${ONTOLOGY}ex:a ex:mother ex:m , ex:n .`,
        options: { closedWorld: true },
        expect: [{ severity: 'error', subject: 'ex:a' }],
      },
      {
        name: 'values through a sub-property count for the functional super-property (rdfs7)',
        data: `${ONTOLOGY}ex:a ex:mother ex:m .\nex:a ex:biologicalMother ex:n .`,
        expect: [{ severity: 'warning', subject: 'ex:a', predicate: 'ex:mother', line: 6 }],
      },
      {
        name: 'declared in a --schema file',
        schema: ONTOLOGY,
        data: `\nex:a ex:birthDate "2000-01-01"^^xsd:date , "1999-01-01"^^xsd:date .`,
        expect: [{ severity: 'error', line: 2 }],
      },
    ],
  });

  it('10,000 values on one subject give one finding, quickly', async () => {
    const values = Array.from({ length: 10_000 }, (_, i) => `ex:a ex:birthDate ${i} .`).join('\n');
    const started = performance.now();
    const found = await findingsOf('functional', { data: `${ONTOLOGY}${values}` });
    expect(found).toHaveLength(1);
    expect(found[0]!.evidence.values).toBe(10_000);
    expect((found[0]!.evidence.sample as unknown[]).length).toBe(10);
    expect(found[0]!.source?.line).toBe(6);
    expect(performance.now() - started).toBeLessThan(20_000);
  });
});

import { describe } from 'vitest';
import { runCases } from './helpers.js';

const births = (n: number, from = 0): string => Array.from({ length: n }, (_, i) => `ex:p${from + i} ex:bornIn ex:town${(from + i) % 7} .`).join('\n');
const dates = (n: number): string => Array.from({ length: n }, (_, i) => `ex:p${i} ex:born "2001-01-${String(1 + (i % 28)).padStart(2, '0')}"^^xsd:date .`).join('\n');
const ids = (n: number): string => Array.from({ length: n }, (_, i) => `ex:p${i} ex:passport "P${i}" .`).join('\n');

describe('mined-cardinality', () => {
  runCases('mined-cardinality', {
    valid: [
      { name: 'one value per subject everywhere', data: `\n${births(40)}` },
      { name: 'too few subjects to mine a rule', data: `\n${births(10)}\nex:p0 ex:bornIn ex:elsewhere .` },
      { name: 'a value per language is the usual shape of labels', data: `\n${Array.from({ length: 30 }, (_, i) => `ex:p${i} ex:label "n${i}"@en .`).join('\n')}\nex:p0 ex:label "n0"@fr .` },
      {
        // Dates, numbers and booleans are shared by nature: two subjects on one date break no key.
        name: 'two subjects born on the same date, where most dates have one subject',
        data: `\n${dates(28)}\nex:p28 ex:born "2001-01-05"^^xsd:date .`,
      },
      {
        name: 'a property declared functional is left to the functional check',
        data: `\nex:bornIn a owl:FunctionalProperty .\n${births(40)}\nex:p0 ex:bornIn ex:elsewhere .`,
      },
    ],
    invalid: [
      {
        name: 'a subject with two values where 40 of 41 have one',
        data: `\n${births(41)}\nex:p0 ex:bornIn ex:elsewhere .`,
        expect: [{ severity: 'note', subject: 'ex:p0', predicate: 'ex:bornIn', object: '', line: 43, evidence: { direction: 'out', values: 2, support: 41, single: 40 } }],
      },
      {
        name: 'an object shared by two subjects where every other has one',
        data: `\n${ids(40)}\nex:p40 ex:passport "P3" .`,
        expect: [{ severity: 'note', subject: '', object: '"P3"', line: 42, evidence: { direction: 'in', values: 2 } }],
      },
    ],
  });
});

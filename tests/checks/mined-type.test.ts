import { describe } from 'vitest';
import { runCases } from './helpers.js';

/** `n` triples `ex:s<i> ex:worksFor ex:o<i>` with typed subjects and objects, one per line. */
function employment(n: number, objectType = 'ex:Org', subjectType = 'ex:Person', from = 0): string {
  const lines: string[] = [];
  for (let i = from; i < from + n; i++) lines.push(`ex:s${i} a ${subjectType} ; ex:worksFor ex:o${i} . ex:o${i} a ${objectType} .`);
  return lines.join('\n');
}

describe('mined-type', () => {
  runCases('mined-type', {
    valid: [
      { name: 'every object has the usual type', data: `\n${employment(40)}` },
      { name: 'too few triples to mine a rule (support below 20)', data: `\n${employment(10)}\n${employment(1, 'ex:City', 'ex:Person', 10)}` },
      { name: 'a split distribution gives no rule at 0.95', data: `\n${employment(30)}\n${employment(10, 'ex:Agency', 'ex:Person', 30)}` },
      { name: 'an untyped object carries no evidence', data: `\n${employment(40)}\nex:x ex:worksFor ex:untyped .` },
      {
        name: 'a declared range leaves the predicate to the range check',
        data: `\nex:worksFor rdfs:range ex:Org .\n${employment(40)}\n${employment(1, 'ex:City', 'ex:Person', 40)}`,
      },
    ],
    invalid: [
      {
        name: 'an object typed unlike 40 of 41: a note with the counts',
        data: `\n${employment(40)}\n${employment(1, 'ex:City', 'ex:Person', 40)}`,
        expect: [
          {
            severity: 'note',
            subject: 'ex:s40',
            object: 'ex:o40',
            line: 42,
            message: /is not a <http:\/\/example.org\/Org>, unlike 40 of the 41 typed objects/,
            evidence: { position: 'object', expected: 'http://example.org/Org', support: 41, count: 40, types: [{ class: 'http://example.org/City', count: 1 }] },
          },
        ],
      },
      {
        name: 'a subject typed unlike the rest',
        data: `\n${employment(40)}\n${employment(1, 'ex:Org', 'ex:Robot', 40)}`,
        expect: [{ subject: 'ex:s40', evidence: { position: 'subject', expected: 'http://example.org/Person' } }],
      },
      {
        name: 'a literal where the predicate almost always has a typed resource',
        data: `\n${employment(40)}\nex:s40 ex:worksFor "ACME" .`,
        expect: [{ object: '"ACME"', evidence: { expected: 'http://example.org/Org' } }],
      },
      {
        name: 'a literal of an unusual datatype',
        data: `\n${Array.from({ length: 30 }, (_, i) => `ex:s${i} ex:age ${i} .`).join('\n')}\nex:s99 ex:age "old" .`,
        expect: [{ object: '"old"', evidence: { expected: 'http://www.w3.org/2001/XMLSchema#integer' } }],
      },
      {
        name: 'a warning when the rule holds on 99% of at least 100',
        data: `\n${employment(150)}\n${employment(1, 'ex:City', 'ex:Person', 150)}`,
        expect: [{ severity: 'warning', subject: 'ex:s150' }],
      },
      {
        name: 'thresholds are options: --min-support 5 --min-confidence 0.8',
        data: `\n${employment(9)}\n${employment(1, 'ex:City', 'ex:Person', 9)}`,
        options: { minSupport: 5, minConfidence: 0.8 },
        expect: [{ subject: 'ex:s9', evidence: { support: 10, count: 9, confidence: 0.9 } }],
      },
    ],
  });
});

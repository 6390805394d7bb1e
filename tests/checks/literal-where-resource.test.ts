import { describe } from 'vitest';
import { runCases } from './helpers.js';

describe('literal-where-resource', () => {
  runCases('literal-where-resource', {
    valid: [
      { name: 'a resource for a class range', data: `\nex:employer rdfs:range ex:Org .\nex:a ex:employer ex:acme .` },
      { name: 'a literal for a property with no range', data: `\nex:a ex:employer "ACME" .` },
      { name: 'a literal for a datatype range', data: `\nex:age rdfs:range xsd:integer .\nex:a ex:age 3 .` },
    ],
    invalid: [
      { name: 'a literal for a class range', data: `\nex:employer rdfs:range ex:Org .\nex:a ex:employer "ACME" .`, expect: [{ severity: 'error', subject: 'ex:a', object: '"ACME"', line: 3, message: /range <http:\/\/example.org\/Org>/ }] },
      { name: 'a literal for an owl:ObjectProperty', data: `\nex:employer a owl:ObjectProperty .\nex:a ex:employer 7 .`, expect: [{ severity: 'error', line: 3, message: /owl:ObjectProperty/ }] },
      { name: 'range inherited from a super-property', data: `\nex:employer rdfs:range ex:Org .\nex:boss rdfs:subPropertyOf ex:employer .\nex:a ex:boss "Bo" .`, expect: [{ line: 4 }] },
    ],
  });
});

import { describe } from 'vitest';
import { runCases } from './helpers.js';

describe('literal-lexical', () => {
  runCases('literal-lexical', {
    valid: [
      { name: 'well-formed typed literals', data: `\nex:a ex:p 1, -0.5, 1.5e3, true, "2024-02-29"^^xsd:date, "2024-02-29T23:59:59Z"^^xsd:dateTime, "2024"^^xsd:gYear, "http://example.org/x"^^xsd:anyURI .` },
      { name: 'derived integer types within bounds', data: `\nex:a ex:p "127"^^xsd:byte, "0"^^xsd:nonNegativeInteger, "4294967295"^^xsd:unsignedInt .` },
      { name: 'unknown datatypes are not judged', data: `\nex:a ex:p "whatever"^^ex:myType .` },
      { name: 'well-formed language tags', data: `\nex:a ex:p "colour"@en-GB, "Farbe"@de-CH-1901, "x"@zh-Hant-TW .` },
    ],
    invalid: [
      { name: 'integer with a decimal point', data: `\nex:a ex:p "1.0"^^xsd:integer .`, expect: [{ severity: 'error', line: 2, message: /not in its lexical space \(xsd:integer\)/, evidence: { problem: 'syntax', lexical: '1.0' } }] },
      { name: 'a day February does not have', data: `\nex:a ex:p "2023-02-29"^^xsd:date .`, expect: [{ severity: 'error', evidence: { problem: 'day' } }] },
      { name: 'byte out of range', data: `\nex:a ex:p "128"^^xsd:byte .`, expect: [{ evidence: { problem: 'bounds' } }] },
      { name: 'boolean spelled out', data: `\nex:a ex:p "yes"^^xsd:boolean .`, expect: [{ severity: 'error' }] },
      { name: 'dateTime without seconds', data: `\nex:a ex:p "2024-01-01T10:00"^^xsd:dateTime .`, expect: [{ severity: 'error' }] },
      { name: 'the same bad literal on two triples: two findings', data: `\nex:a ex:p "x"^^xsd:double .\nex:b ex:p "x"^^xsd:double .`, expect: [{ line: 2 }, { line: 3 }] },
      { name: 'anyURI with a space is valid XSD but not a usable IRI: a note', data: `\nex:a ex:p "http://example.org/a b"^^xsd:anyURI .`, expect: [{ severity: 'note' }] },
      // RFC 5646 Appendix A lists both as ill-formed: two region subtags; a one-letter primary subtag.
      { name: 'malformed language tag: two regions', data: `\nex:a ex:p "x"@de-419-DE .`, expect: [{ severity: 'error', message: /"de-419-de"/ }] },
      { name: 'malformed language tag: one-letter primary subtag', data: `\nex:a ex:p "x"@a-DE .`, expect: [{ severity: 'error', evidence: { tag: 'a-de' } }] },
    ],
  });
});

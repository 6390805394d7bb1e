/**
 * Lexical spaces of XSD 1.1 Part 2: Datatypes (W3C Recommendation, 5 April 2012). The valid examples
 * are those the Recommendation gives in each datatype's section (recalled from memory, section numbers
 * as in the 2012 text); the invalid ones are our own, each outside the grammar or constraint cited.
 */
import { describe, expect, it } from 'vitest';
import { XSD } from '../../src/graph/terms.js';
import { lexicalProblem } from '../../src/schema/xsd.js';

interface Examples {
  section: string;
  valid: string[];
  invalid: string[];
}

const EXAMPLES: Record<string, Examples> = {
  decimal: {
    // §3.3.3: "-1.23, 12678967.543233, +100000.00, 210"; decimalLexicalRep allows "1." and ".5".
    section: '§3.3.3 decimal',
    valid: ['-1.23', '12678967.543233', '+100000.00', '210', '1.', '.5', '-0', '007'],
    invalid: ['', '.', '+', '1e5', '1,5', ' 1', '1 ', 'INF', '--1', '1.2.3', '0x1A'],
  },
  integer: {
    // §3.4.13: "-1, 0, 12678967543233, +100000".
    section: '§3.4.13 integer',
    valid: ['-1', '0', '12678967543233', '+100000', '0001'],
    invalid: ['', '1.0', '1.', '+', '1e3', 'one', '١٢'],
  },
  float: {
    // §3.3.5: "-1E4, 1267.43233E12, 12.78e-2, 12, -0, 0 and INF"; XSD 1.1 adds +INF; NaN is unsigned.
    section: '§3.3.5 float',
    valid: ['-1E4', '1267.43233E12', '12.78e-2', '12', '-0', '0', 'INF', '-INF', '+INF', 'NaN', '1.e5', '.5E-3'],
    invalid: ['', 'E4', '1E', '1.0E+', 'inf', 'Infinity', '+NaN', '-NaN', 'nan', '1,0'],
  },
  double: {
    // §3.3.6: the same examples as float.
    section: '§3.3.6 double',
    valid: ['-1E4', '1267.43233E12', '12.78e-2', '12', '-0', '0', 'INF', 'NaN'],
    invalid: ['1E4.5', 'e10', '1d3', '- 1'],
  },
  boolean: {
    // §3.3.2: the lexical space is {true, false, 1, 0}.
    section: '§3.3.2 boolean',
    valid: ['true', 'false', '1', '0'],
    invalid: ['TRUE', 'True', 'yes', '01', '', ' true'],
  },
  date: {
    // §3.3.9: "2002-10-10+13:00" and "2002-10-09-11:00"; year 0000 is allowed in 1.1 (§3.3.9 note);
    // §D.3.3 day-of-month constraint; timezones range over -14:00 … +14:00.
    section: '§3.3.9 date',
    valid: ['2002-10-10+13:00', '2002-10-09-11:00', '2002-10-10Z', '2002-10-10', '0000-01-01', '-0044-03-15', '12020-01-01', '2000-02-29', '2024-02-29'],
    invalid: ['02-10-10', '2002-10-1', '2002-13-01', '2002-00-10', '2002-10-32', '2001-02-29', '1900-02-29', '2002-04-31', '2002-10-10+14:30', '2002-10-10+15:00', '02002-10-10', '2002-10-10T00:00:00', '2002/10/10'],
  },
  dateTime: {
    // §3.3.7: "2002-10-10T12:00:00-05:00" and "2002-10-10T17:00:00Z"; 24:00:00 ends a day (§3.3.7.2).
    section: '§3.3.7 dateTime',
    valid: ['2002-10-10T12:00:00-05:00', '2002-10-10T17:00:00Z', '2002-10-10T12:00:00', '2002-10-10T12:00:00.123456', '2000-12-31T24:00:00', '-0001-01-01T00:00:00+14:00'],
    invalid: ['2002-10-10T12:00', '2002-10-10 12:00:00', '2002-10-10T25:00:00', '2002-10-10T24:00:01', '2002-10-10T12:60:00', '2002-10-10T12:00:60', '2002-10-10T12:00:00.', '2002-02-30T00:00:00', '2002-10-10T12:00:00+14:01', '2002-10-10'],
  },
  gYear: {
    // §3.3.11: four or more digits, no leading zero beyond four, optional timezone.
    section: '§3.3.11 gYear',
    valid: ['1999', '2002Z', '-0045', '0000', '12345', '2002+05:00'],
    invalid: ['99', '02002', '1999-01', '+1999', 'MMXX', ''],
  },
  anyURI: {
    // §3.3.17: any finite sequence of XML Chars (XML 1.0 §2.2) is in the lexical space in XSD 1.1.
    section: '§3.3.17 anyURI',
    valid: ['http://www.example.com/', 'urn:example:a', '', '../relative#frag', 'http://example.org/a b'],
    invalid: ['http://example.org/\u0001', 'a\u0000b', 'x\uFFFE'],
  },
  byte: {
    // §3.4.19: -128 … 127.
    section: '§3.4.19 byte',
    valid: ['-128', '127', '+5', '0'],
    invalid: ['128', '-129', '1.0'],
  },
  nonNegativeInteger: {
    // §3.4.20: 0 and up.
    section: '§3.4.20 nonNegativeInteger',
    valid: ['0', '+7', '-0', '123456789012345678901234567890'],
    invalid: ['-1', '1.5'],
  },
};

describe('XSD 1.1 Part 2 lexical spaces', () => {
  for (const [type, ex] of Object.entries(EXAMPLES)) {
    it(`${ex.section}: the valid examples are inside, the invalid ones outside`, () => {
      for (const v of ex.valid) expect(lexicalProblem(v, `${XSD}${type}`), `${JSON.stringify(v)} is a valid ${type}`).toBeUndefined();
      for (const v of ex.invalid) expect(lexicalProblem(v, `${XSD}${type}`), `${JSON.stringify(v)} is not a valid ${type}`).toBeDefined();
    });
  }

  it('an unknown datatype is never judged', () => {
    expect(lexicalProblem('anything', 'http://example.org/myType')).toBeUndefined();
    expect(lexicalProblem('anything', `${XSD}string`)).toBeUndefined();
  });
});

import { describe, expect, it } from 'vitest';
import { XSD, literalKey } from '../../src/graph/terms.js';
import { compareLiterals, datatypeConforms, literalValueKey } from '../../src/schema/xsd.js';

const lit = (lexical: string, type: string): string => literalKey(lexical, `${XSD}${type}`);

describe('compareLiterals', () => {
  it('compares numbers across the numeric datatypes', () => {
    expect(compareLiterals(lit('1', 'integer'), lit('1.0', 'decimal'))).toBe(0);
    expect(compareLiterals(lit('2', 'int'), lit('1.5e0', 'double'))).toBeGreaterThan(0);
    expect(compareLiterals(lit('-INF', 'double'), lit('-99999', 'integer'))).toBeLessThan(0);
    // Integers beyond 2^53 are compared exactly.
    expect(compareLiterals(lit('9007199254740993', 'integer'), lit('9007199254740992', 'integer'))).toBeGreaterThan(0);
  });

  it('NaN, ill-formed literals and mixed kinds are incomparable', () => {
    expect(compareLiterals(lit('NaN', 'double'), lit('1', 'integer'))).toBeUndefined();
    expect(compareLiterals(lit('x', 'integer'), lit('1', 'integer'))).toBeUndefined();
    expect(compareLiterals(literalKey('1'), lit('1', 'integer'))).toBeUndefined();
    expect(compareLiterals('http://example.org/a', lit('1', 'integer'))).toBeUndefined();
    expect(compareLiterals(literalKey('a', undefined, 'en'), literalKey('b'))).toBeUndefined();
  });

  it('compares dateTimes across timezones, and with and without one only when more than 14 hours apart', () => {
    // Source: XSD 1.1 Part 2 §D.2.3 (order relation on dateTime values; from memory).
    expect(compareLiterals(lit('2020-01-01T12:00:00+02:00', 'dateTime'), lit('2020-01-01T10:00:00Z', 'dateTime'))).toBe(0);
    expect(compareLiterals(lit('2020-01-01T12:00:00', 'dateTime'), lit('2020-01-01T10:00:00Z', 'dateTime'))).toBeUndefined();
    expect(compareLiterals(lit('2020-01-03T12:00:00', 'dateTime'), lit('2020-01-01T10:00:00Z', 'dateTime'))).toBeGreaterThan(0);
    expect(compareLiterals(lit('2019-12-31', 'date'), lit('2020-01-01', 'date'))).toBeLessThan(0);
  });

  it('compares plain strings by code point', () => {
    expect(compareLiterals(literalKey('B'), literalKey('a'))).toBeLessThan(0);
    expect(compareLiterals(literalKey('abc'), literalKey('abc'))).toBe(0);
  });
});

describe('literalValueKey', () => {
  it('is equal exactly for literals with the same value', () => {
    expect(literalValueKey(lit('1', 'integer'))).toBe(literalValueKey(lit('01', 'integer')));
    expect(literalValueKey(lit('1', 'integer'))).toBe(literalValueKey(lit('1.0', 'decimal')));
    expect(literalValueKey(lit('true', 'boolean'))).toBe(literalValueKey(lit('1', 'boolean')));
    expect(literalValueKey(lit('1', 'integer'))).not.toBe(literalValueKey(literalKey('1')));
    expect(literalValueKey(lit('2020-01-01T12:00:00+02:00', 'dateTime'))).toBe(literalValueKey(lit('2020-01-01T10:00:00Z', 'dateTime')));
    expect(literalValueKey(literalKey('a'))).not.toBe(literalValueKey(literalKey('a', undefined, 'en')));
  });
});

describe('datatypeConforms', () => {
  it('follows derivation by restriction and RDF 1.1 literal classes', () => {
    // Source: XSD 1.1 Part 2 §3.4 (the built-in derived types and their bases).
    expect(datatypeConforms(`${XSD}byte`, `${XSD}integer`)).toBe(true);
    expect(datatypeConforms(`${XSD}byte`, `${XSD}decimal`)).toBe(true);
    expect(datatypeConforms(`${XSD}unsignedByte`, `${XSD}nonNegativeInteger`)).toBe(true);
    expect(datatypeConforms(`${XSD}integer`, `${XSD}int`)).toBe(false);
    expect(datatypeConforms(`${XSD}double`, `${XSD}decimal`)).toBe(false);
    expect(datatypeConforms(`${XSD}token`, `${XSD}string`)).toBe(true);
    expect(datatypeConforms(`${XSD}string`, 'http://www.w3.org/2000/01/rdf-schema#Literal')).toBe(true);
    expect(datatypeConforms('http://www.w3.org/1999/02/22-rdf-syntax-ns#langString', `${XSD}string`)).toBe(false);
  });
});

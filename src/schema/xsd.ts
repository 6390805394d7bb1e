import { RDF_LANG_STRING, XSD, XSD_STRING, literalParts } from '../graph/terms.js';

/**
 * Lexical spaces of the XSD 1.1 datatypes plumb checks, and value comparison for SHACL's range
 * components. Source: W3C XML Schema Definition Language (XSD) 1.1 Part 2: Datatypes, §3.3
 * (primitive datatypes) and §3.4 (derived integer types); the regular expressions are the ones that
 * section gives for each lexical space, anchored.
 *
 * RDF 1.1 Concepts §3.3 compares a literal's lexical form with the lexical space as written, without
 * XSD's whitespace collapsing, so `" 1"^^xsd:integer` is ill-typed here.
 */

const TZ = '(Z|(\\+|-)((0[0-9]|1[0-3]):[0-5][0-9]|14:00))?';
const YEAR = '-?([1-9][0-9]{3,}|0[0-9]{3})';
const MONTH_DAY = '(0[1-9]|1[0-2])-(0[1-9]|[12][0-9]|3[01])';
const TIME = '(([01][0-9]|2[0-3]):[0-5][0-9]:[0-5][0-9](\\.[0-9]+)?|(24:00:00(\\.0+)?))';

const DECIMAL = /^(\+|-)?([0-9]+(\.[0-9]*)?|\.[0-9]+)$/;
const INTEGER = /^[-+]?[0-9]+$/;
const FLOAT = /^((\+|-)?([0-9]+(\.[0-9]*)?|\.[0-9]+)([Ee](\+|-)?[0-9]+)?|(\+|-)?INF|NaN)$/;
const BOOLEAN = /^(true|false|1|0)$/;
const DATE = new RegExp(`^${YEAR}-${MONTH_DAY}${TZ}$`);
const DATE_TIME = new RegExp(`^${YEAR}-${MONTH_DAY}T${TIME}${TZ}$`);
const G_YEAR = new RegExp(`^${YEAR}${TZ}$`);
/** XML 1.0 `Char`: anything but most C0 controls, surrogates and U+FFFE/U+FFFF. */
const XML_CHARS = /^[\t\n\r\u0020-\uD7FF\uE000-\uFFFD\u{10000}-\u{10FFFF}]*$/u;

/** Inclusive bounds of the integer types derived from xsd:integer (XSD 1.1 Part 2 §3.4.13–§3.4.27). */
const INTEGER_BOUNDS: Record<string, readonly [bigint | undefined, bigint | undefined]> = {
  integer: [undefined, undefined],
  nonNegativeInteger: [0n, undefined],
  positiveInteger: [1n, undefined],
  nonPositiveInteger: [undefined, 0n],
  negativeInteger: [undefined, -1n],
  long: [-(2n ** 63n), 2n ** 63n - 1n],
  int: [-(2n ** 31n), 2n ** 31n - 1n],
  short: [-32768n, 32767n],
  byte: [-128n, 127n],
  unsignedLong: [0n, 2n ** 64n - 1n],
  unsignedInt: [0n, 2n ** 32n - 1n],
  unsignedShort: [0n, 65535n],
  unsignedByte: [0n, 255n],
};

/** Why a lexical form is outside its datatype's lexical space, or undefined when it is inside. */
export type LexicalProblem = 'syntax' | 'day' | 'bounds' | 'chars';

function dayFits(year: number, month: number, day: number): boolean {
  if (month === 2) {
    const leap = (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
    return day <= (leap ? 29 : 28);
  }
  if (month === 4 || month === 6 || month === 9 || month === 11) return day <= 30;
  return true;
}

/** Checks the day-of-month constraint of XSD 1.1 Part 2 §D.3.3 on a date or dateTime that matched the pattern. */
function checkDay(lexical: string): LexicalProblem | undefined {
  const m = /^(-?\d+)-(\d\d)-(\d\d)/.exec(lexical);
  if (!m) return 'syntax';
  return dayFits(Number(m[1]), Number(m[2]), Number(m[3])) ? undefined : 'day';
}

/** The datatypes whose lexical space plumb knows. */
export function isCheckedDatatype(datatype: string): boolean {
  if (!datatype.startsWith(XSD)) return false;
  const local = datatype.slice(XSD.length);
  return local in INTEGER_BOUNDS || CHECKED.has(local);
}
const CHECKED = new Set(['decimal', 'double', 'float', 'boolean', 'date', 'dateTime', 'gYear', 'anyURI']);

/**
 * Whether `lexical` is in the lexical space of `datatype`; undefined when it is, or when plumb does
 * not know the datatype (an unknown datatype is not an error).
 */
export function lexicalProblem(lexical: string, datatype: string): LexicalProblem | undefined {
  if (!datatype.startsWith(XSD)) return undefined;
  const local = datatype.slice(XSD.length);
  const bounds = INTEGER_BOUNDS[local];
  if (bounds) {
    if (!INTEGER.test(lexical)) return 'syntax';
    const [min, max] = bounds;
    if (min === undefined && max === undefined) return undefined;
    const value = BigInt(lexical);
    if ((min !== undefined && value < min) || (max !== undefined && value > max)) return 'bounds';
    return undefined;
  }
  switch (local) {
    case 'decimal':
      return DECIMAL.test(lexical) ? undefined : 'syntax';
    case 'double':
    case 'float':
      return FLOAT.test(lexical) ? undefined : 'syntax';
    case 'boolean':
      return BOOLEAN.test(lexical) ? undefined : 'syntax';
    case 'date':
      return DATE.test(lexical) ? checkDay(lexical) : 'syntax';
    case 'dateTime':
      return DATE_TIME.test(lexical) ? checkDay(lexical) : 'syntax';
    case 'gYear':
      return G_YEAR.test(lexical) ? undefined : 'syntax';
    case 'anyURI':
      return XML_CHARS.test(lexical) ? undefined : 'chars';
    default:
      return undefined;
  }
}

/**
 * An xsd:anyURI lexical form that XSD 1.1 accepts but that is not an IRI reference in practice
 * (RFC 3987 excludes spaces, angle brackets, quotes, braces, `|`, `\`, `^` and backquote).
 */
export function isUnusableUri(lexical: string): boolean {
  return /[\s<>"{}|\\^`]/u.test(lexical);
}

/** XSD datatype IRIs derived (by restriction) from another, for range checks: child → parent. */
const DERIVED_FROM: Record<string, string> = {
  integer: 'decimal',
  nonPositiveInteger: 'integer',
  negativeInteger: 'nonPositiveInteger',
  long: 'integer',
  int: 'long',
  short: 'int',
  byte: 'short',
  nonNegativeInteger: 'integer',
  unsignedLong: 'nonNegativeInteger',
  unsignedInt: 'unsignedLong',
  unsignedShort: 'unsignedInt',
  unsignedByte: 'unsignedShort',
  positiveInteger: 'nonNegativeInteger',
  normalizedString: 'string',
  token: 'normalizedString',
  language: 'token',
  Name: 'token',
  NMTOKEN: 'token',
  NCName: 'Name',
  ID: 'NCName',
  IDREF: 'NCName',
  ENTITY: 'NCName',
  dateTimeStamp: 'dateTime',
  dayTimeDuration: 'duration',
  yearMonthDuration: 'duration',
};

const RDFS_LITERAL = 'http://www.w3.org/2000/01/rdf-schema#Literal';
const PLAIN_LITERAL = 'http://www.w3.org/1999/02/22-rdf-syntax-ns#PlainLiteral';

/**
 * Whether a literal of datatype `actual` belongs to the value space of `expected` (XSD derivation by
 * restriction; `rdfs:Literal` holds every literal; RDF 1.1: a language-tagged string is
 * `rdf:langString`, not `xsd:string`).
 */
export function datatypeConforms(actual: string, expected: string): boolean {
  if (actual === expected || expected === RDFS_LITERAL) return true;
  if (expected === PLAIN_LITERAL) return actual === XSD_STRING || actual === RDF_LANG_STRING;
  if (!actual.startsWith(XSD) || !expected.startsWith(XSD)) return false;
  let local: string | undefined = actual.slice(XSD.length);
  const target = expected.slice(XSD.length);
  if (target === 'anyAtomicType' || target === 'anySimpleType') return true;
  for (let hops = 0; local !== undefined && hops < 10; hops++) {
    if (local === target) return true;
    local = DERIVED_FROM[local];
  }
  return false;
}

// ---- Value comparison (SHACL §4.3 value range components use SPARQL's `<` and `<=`) ----

type Comparable =
  | { kind: 'number'; value: number; big?: bigint }
  | { kind: 'time'; ms: number; tz: boolean }
  | { kind: 'string'; value: string }
  | { kind: 'boolean'; value: number };

const NUMERIC = new Set(['decimal', 'double', 'float', ...Object.keys(INTEGER_BOUNDS)]);

function comparable(key: string): Comparable | undefined {
  if (key.charCodeAt(0) !== 34) return undefined;
  const { lexical, datatype, language } = literalParts(key);
  if (language !== undefined) return undefined;
  if (datatype === XSD_STRING) return { kind: 'string', value: lexical };
  if (!datatype.startsWith(XSD) || lexicalProblem(lexical, datatype) !== undefined) return undefined;
  const local = datatype.slice(XSD.length);
  if (NUMERIC.has(local)) {
    const isInteger = local in INTEGER_BOUNDS;
    const value = lexical === 'INF' || lexical === '+INF' ? Infinity : lexical === '-INF' ? -Infinity : Number(lexical);
    return isInteger ? { kind: 'number', value, big: BigInt(lexical) } : { kind: 'number', value };
  }
  if (local === 'boolean') return { kind: 'boolean', value: lexical === 'true' || lexical === '1' ? 1 : 0 };
  if (local === 'date' || local === 'dateTime') return timeValue(lexical);
  return undefined;
}

function timeValue(lexical: string): Comparable | undefined {
  const m = /^(-?\d+)-(\d\d)-(\d\d)(?:T(\d\d):(\d\d):(\d\d)(\.\d+)?)?(Z|[+-]\d\d:\d\d)?$/.exec(lexical);
  if (!m) return undefined;
  const [, y, mo, d, h = '0', mi = '0', s = '0', frac = '', tz] = m;
  const date = new Date(0);
  date.setUTCFullYear(Number(y), Number(mo) - 1, Number(d));
  date.setUTCHours(Number(h), Number(mi), Number(s), frac ? Math.round(Number(frac) * 1000) : 0);
  let ms = date.getTime();
  if (tz && tz !== 'Z') {
    const sign = tz.startsWith('-') ? -1 : 1;
    ms -= sign * (Number(tz.slice(1, 3)) * 60 + Number(tz.slice(4, 6))) * 60_000;
  }
  return { kind: 'time', ms, tz: tz !== undefined };
}

const FOURTEEN_HOURS = 14 * 3600 * 1000;

/**
 * Compares two literal keys by value as SPARQL's operators do: numbers with numbers, date/dateTime
 * with date/dateTime, strings with strings, booleans with booleans. Returns a negative number, zero or
 * a positive number, or undefined when the two are not comparable (a type error, which SHACL treats as
 * a violation). A time with a timezone and one without are comparable only when more than 14 hours
 * apart (XSD 1.1 Part 2 §D.2.3, the partial order of dateTime values).
 */
export function compareLiterals(a: string, b: string): number | undefined {
  const x = comparable(a);
  const y = comparable(b);
  if (!x || !y || x.kind !== y.kind) return undefined;
  switch (x.kind) {
    case 'number': {
      const yy = y as typeof x;
      if (x.big !== undefined && yy.big !== undefined) return x.big < yy.big ? -1 : x.big > yy.big ? 1 : 0;
      if (Number.isNaN(x.value) || Number.isNaN(yy.value)) return undefined;
      return x.value < yy.value ? -1 : x.value > yy.value ? 1 : 0;
    }
    case 'time': {
      const yy = y as typeof x;
      const diff = x.ms - yy.ms;
      if (x.tz !== yy.tz && Math.abs(diff) <= FOURTEEN_HOURS) return undefined;
      return diff < 0 ? -1 : diff > 0 ? 1 : 0;
    }
    case 'string': {
      const yy = (y as typeof x).value;
      return x.value < yy ? -1 : x.value > yy ? 1 : 0;
    }
    case 'boolean':
      return x.value - (y as typeof x).value;
  }
}

/**
 * A key equal for two literals exactly when they denote the same data value (in the cases plumb
 * compares: numbers, booleans, dates and dateTimes with timezones); the literal key itself otherwise.
 * Value keys start with `"` like literal keys, so they never equal an IRI.
 */
export function literalValueKey(key: string): string {
  const c = comparable(key);
  if (!c) return key;
  switch (c.kind) {
    case 'number':
      return c.big !== undefined ? `"n:${c.big}` : Number.isInteger(c.value) && Math.abs(c.value) < 2 ** 53 ? `"n:${BigInt(c.value)}` : `"n:${c.value}`;
    case 'boolean':
      return `"b:${c.value}`;
    case 'time':
      return c.tz ? `"t:${c.ms}` : key;
    case 'string':
      return key;
  }
}

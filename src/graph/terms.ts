/**
 * Terms are held once each in a dictionary and referred to by dense integer ids everywhere else.
 *
 * A term's key is its canonical text:
 * - an IRI is the IRI itself, without angle brackets (`http://example.org/a`);
 * - a blank node is `_:` followed by a label that the reader has already made unique per file;
 * - a literal is written as in N-Triples: `"lexical form"` with N-Triples string escapes, followed by
 *   `@lang` or `^^<datatype IRI>`, or nothing for `xsd:string`.
 * The first character decides the kind, so no per-term flag is needed to tell them apart.
 */
export const enum TermKind {
  Iri = 0,
  Blank = 1,
  Literal = 2,
}

export const XSD = 'http://www.w3.org/2001/XMLSchema#';
export const RDF = 'http://www.w3.org/1999/02/22-rdf-syntax-ns#';
export const RDFS = 'http://www.w3.org/2000/01/rdf-schema#';
export const OWL = 'http://www.w3.org/2002/07/owl#';
export const SH = 'http://www.w3.org/ns/shacl#';
export const RDF_TYPE = `${RDF}type`;
export const XSD_STRING = `${XSD}string`;
export const RDF_LANG_STRING = `${RDF}langString`;

export function termKind(key: string): TermKind {
  const c = key.charCodeAt(0);
  if (c === 34 /* " */) return TermKind.Literal;
  if (c === 95 /* _ */ && key.charCodeAt(1) === 58 /* : */) return TermKind.Blank;
  return TermKind.Iri;
}

export interface LiteralParts {
  lexical: string;
  /** The datatype IRI; `rdf:langString` when a language tag is present, `xsd:string` when none is given. */
  datatype: string;
  language: string | undefined;
}

const ESCAPES: Record<string, string> = { '\\': '\\\\', '"': '\\"', '\n': '\\n', '\r': '\\r' };

/** Builds the key of a literal from its parts. A datatype of `xsd:string` is left implicit. */
export function literalKey(lexical: string, datatype?: string, language?: string): string {
  const body = `"${lexical.replace(/[\\"\n\r]/g, (ch) => ESCAPES[ch] ?? ch)}"`;
  if (language) return `${body}@${language.toLowerCase()}`;
  if (datatype && datatype !== XSD_STRING) return `${body}^^<${datatype}>`;
  return body;
}

/** Splits a literal key back into its parts. */
export function literalParts(key: string): LiteralParts {
  const end = key.lastIndexOf('"');
  const raw = key.slice(1, end);
  const lexical = raw.includes('\\')
    ? raw.replace(/\\(u[0-9A-Fa-f]{4}|U[0-9A-Fa-f]{8}|.)/g, (_, e: string) => {
        if (e === 'n') return '\n';
        if (e === 'r') return '\r';
        if (e === 't') return '\t';
        if (e === 'b') return '\b';
        if (e === 'f') return '\f';
        if (e.length > 1) return String.fromCodePoint(parseInt(e.slice(1), 16));
        return e;
      })
    : raw;
  const tail = key.slice(end + 1);
  if (tail.startsWith('@')) return { lexical, datatype: RDF_LANG_STRING, language: tail.slice(1) };
  if (tail.startsWith('^^<')) return { lexical, datatype: tail.slice(3, -1), language: undefined };
  return { lexical, datatype: XSD_STRING, language: undefined };
}

/** The N-Triples form of a term key (IRIs in angle brackets), for writing and for messages. */
export function toNTriples(key: string): string {
  switch (termKind(key)) {
    case TermKind.Iri:
      return `<${key}>`;
    default:
      return key;
  }
}

/** V8 caps a Map at 2^24 entries. */
const MAX_TERMS = 16_777_216;

/**
 * A copy of `key` that does not share memory with the string it was cut from. Parsers hand out
 * substrings of their input buffer; V8 keeps such a substring as a view that pins the whole buffer,
 * so keeping one per distinct term would keep the entire file in memory. Short strings are always
 * copied by V8 already.
 */
function detach(key: string): string {
  return key.length < 13 ? key : (JSON.parse(JSON.stringify(key)) as string);
}

/**
 * String ⇄ id dictionary. Ids are dense and assigned in order of first appearance, so a graph read
 * twice from the same files gets the same ids.
 */
export class TermDictionary {
  private readonly ids = new Map<string, number>();
  private readonly keys: string[] = [];

  /** The id of `key`, adding it when new. */
  intern(key: string): number {
    let id = this.ids.get(key);
    if (id === undefined) {
      id = this.keys.length;
      if (id >= MAX_TERMS) {
        throw new RangeError(
          `the term dictionary is full (${MAX_TERMS.toLocaleString('en')} distinct terms)`,
        );
      }
      const own = detach(key);
      this.ids.set(own, id);
      this.keys.push(own);
    }
    return id;
  }

  /** The id of `key`, or -1 when the dictionary does not hold it. */
  id(key: string): number {
    return this.ids.get(key) ?? -1;
  }

  key(id: number): string {
    const k = this.keys[id];
    if (k === undefined)
      throw new RangeError(`term id ${id} is not in the dictionary (size ${this.keys.length})`);
    return k;
  }

  kind(id: number): TermKind {
    return termKind(this.key(id));
  }

  get size(): number {
    return this.keys.length;
  }

  /** All keys in id order (a read-only view; do not modify). */
  allKeys(): readonly string[] {
    return this.keys;
  }
}

import { OWL, RDF, RDFS, SH, XSD } from '../graph/terms.js';

/** The IRIs of RDF, RDFS, OWL 2 and SHACL that the schema reader looks for. */
export const V = {
  type: `${RDF}type`,
  first: `${RDF}first`,
  rest: `${RDF}rest`,
  nil: `${RDF}nil`,
  langString: `${RDF}langString`,
  plainLiteral: `${RDF}PlainLiteral`,
  xmlLiteral: `${RDF}XMLLiteral`,
  html: `${RDF}HTML`,
  json: `${RDF}JSON`,
  rdfProperty: `${RDF}Property`,

  domain: `${RDFS}domain`,
  range: `${RDFS}range`,
  subClassOf: `${RDFS}subClassOf`,
  subPropertyOf: `${RDFS}subPropertyOf`,
  rdfsClass: `${RDFS}Class`,
  rdfsLiteral: `${RDFS}Literal`,
  rdfsResource: `${RDFS}Resource`,
  rdfsDatatype: `${RDFS}Datatype`,

  owlThing: `${OWL}Thing`,
  owlClass: `${OWL}Class`,
  equivalentClass: `${OWL}equivalentClass`,
  equivalentProperty: `${OWL}equivalentProperty`,
  disjointWith: `${OWL}disjointWith`,
  allDisjointClasses: `${OWL}AllDisjointClasses`,
  members: `${OWL}members`,
  functionalProperty: `${OWL}FunctionalProperty`,
  inverseFunctionalProperty: `${OWL}InverseFunctionalProperty`,
  irreflexiveProperty: `${OWL}IrreflexiveProperty`,
  asymmetricProperty: `${OWL}AsymmetricProperty`,
  objectProperty: `${OWL}ObjectProperty`,
  datatypeProperty: `${OWL}DatatypeProperty`,
  sameAs: `${OWL}sameAs`,
} as const;

const PREFIXES: ReadonlyArray<readonly [string, string]> = [
  ['rdf:', RDF],
  ['rdfs:', RDFS],
  ['owl:', OWL],
  ['xsd:', XSD],
  ['sh:', SH],
];

/** A short form for messages: well-known namespaces as prefixes, other IRIs in angle brackets, literals and blank nodes as they are. */
export function shortName(key: string): string {
  if (key === '') return '(none)';
  const c = key.charCodeAt(0);
  if (c === 34 /* " */ || key.startsWith('_:')) return key;
  for (const [prefix, ns] of PREFIXES) {
    if (key.startsWith(ns) && /^[A-Za-z_][\w.-]*$/.test(key.slice(ns.length))) return prefix + key.slice(ns.length);
  }
  return `<${key}>`;
}

/** True for predicates of the RDF, RDFS, OWL and SHACL vocabularies, which describe the schema rather than the data. */
export function isSchemaVocabulary(key: string): boolean {
  return key.startsWith(RDF) || key.startsWith(RDFS) || key.startsWith(OWL) || key.startsWith(SH);
}

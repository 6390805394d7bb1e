import { describe } from 'vitest';
import { atLine, runCases } from './helpers.js';

const ONTOLOGY = `
ex:worksFor rdfs:domain ex:Person .
ex:Employee rdfs:subClassOf ex:Person .
ex:Person owl:disjointWith ex:Place .
ex:City rdfs:subClassOf ex:Place .
ex:leads rdfs:subPropertyOf ex:worksFor .
`;

describe('domain', () => {
  runCases('domain', {
    valid: [
      { name: 'subject has the domain class', data: `${ONTOLOGY}ex:a a ex:Person ; ex:worksFor ex:b .` },
      { name: 'subject has a subclass of the domain (rdfs9)', data: `${ONTOLOGY}ex:a a ex:Employee ; ex:worksFor ex:b .` },
      { name: 'domain read from a --schema file', schema: ONTOLOGY, data: `\nex:a a ex:Employee ; ex:leads ex:b .` },
      { name: 'a predicate without domain', data: `${ONTOLOGY}ex:a ex:likes ex:b .` },
      { name: 'rdfs:Resource as domain requires nothing', data: `\nex:p rdfs:domain rdfs:Resource .\nex:a ex:p ex:b .` },
      {
        name: 'the RDFS vocabulary given as a schema does not flag the axioms themselves',
        schema: `\nrdfs:domain rdfs:domain rdf:Property .\nrdfs:subClassOf rdfs:domain rdfs:Class .`,
        data: `${ONTOLOGY}ex:a a ex:Person ; ex:worksFor ex:b .`,
      },
    ],
    invalid: [
      {
        name: 'untyped subject: missing type, a warning (open world)',
        data: `${ONTOLOGY}ex:a ex:worksFor ex:b .`,
        expect: [{ severity: 'warning', subject: 'ex:a', predicate: 'ex:worksFor', object: 'ex:b', line: 7, message: /has no rdf:type/, evidence: { missing: ['http://example.org/Person'], openWorld: true } }],
      },
      {
        name: 'typed with an unrelated class: missing type',
        data: `${ONTOLOGY}ex:a a ex:Robot ; ex:worksFor ex:b .`,
        expect: [{ severity: 'warning', subject: 'ex:a', message: /typed only <http:\/\/example.org\/Robot>/ }],
      },
      {
        name: 'closed world: missing type is an error',
        data: `${ONTOLOGY}ex:a ex:worksFor ex:b .`,
        options: { closedWorld: true },
        expect: [{ severity: 'error', subject: 'ex:a' }],
      },
      {
        name: 'typed with a class disjoint with the domain: error',
        data: `${ONTOLOGY}ex:paris a ex:City ; ex:worksFor ex:b .`,
        expect: [{ severity: 'error', subject: 'ex:paris', message: /declared disjoint/, evidence: { conflicts: [{ type: 'http://example.org/Place', disjointWith: 'http://example.org/Person', required: 'http://example.org/Person', declaredAt: atLine(4) }] } }],
      },
      {
        name: 'domain inherited down a sub-property (rdfs7 then rdfs2), declared in a --schema file',
        schema: ONTOLOGY,
        data: `\nex:a ex:leads ex:b .\nex:c a ex:Person ; ex:leads ex:d .`,
        expect: [{ severity: 'warning', subject: 'ex:a', predicate: 'ex:leads', line: 2, evidence: { declaredBy: [{ class: 'http://example.org/Person', property: 'http://example.org/worksFor', declaredAt: atLine(2, 'schema.ttl') }] } }],
      },
      {
        name: 'one finding per triple',
        data: `${ONTOLOGY}ex:a ex:worksFor ex:b .\nex:a ex:worksFor ex:c .`,
        expect: [{ line: 7, object: 'ex:b' }, { line: 8, object: 'ex:c' }],
      },
    ],
  });
});

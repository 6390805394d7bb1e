import { describe } from 'vitest';
import { runCases } from './helpers.js';

describe('resource-where-literal', () => {
  runCases('resource-where-literal', {
    valid: [
      { name: 'a literal for a datatype range', data: `\nex:age rdfs:range xsd:integer .\nex:a ex:age 3 .` },
      { name: 'a resource for a class range', data: `\nex:employer rdfs:range ex:Org .\nex:a ex:employer ex:acme .` },
      { name: 'a declared rdfs:Datatype range with a literal', data: `\nex:Celsius a rdfs:Datatype .\nex:temp rdfs:range ex:Celsius .\nex:a ex:temp "21"^^ex:Celsius .` },
    ],
    invalid: [
      { name: 'an IRI for a datatype range', data: `\nex:age rdfs:range xsd:integer .\nex:a ex:age ex:three .`, expect: [{ severity: 'error', object: 'ex:three', line: 3, message: /range xsd:integer/ }] },
      { name: 'a blank node for rdfs:Literal', data: `\nex:note rdfs:range rdfs:Literal .\nex:a ex:note [] .`, expect: [{ severity: 'error', line: 3 }] },
      { name: 'an IRI for an owl:DatatypeProperty', data: `\nex:age a owl:DatatypeProperty .\nex:a ex:age ex:three .`, expect: [{ line: 3, message: /owl:DatatypeProperty/ }] },
      {
        name: 'RDFS annotation properties are data: an IRI as rdfs:label where the schema gives it range rdfs:Literal',
        schema: `\nrdfs:label rdfs:range rdfs:Literal .`,
        data: `\nex:a rdfs:label ex:b .`,
        expect: [{ line: 2 }],
      },
      { name: 'an IRI for a range declared rdfs:Datatype', data: `\nex:Celsius a rdfs:Datatype .\nex:temp rdfs:range ex:Celsius .\nex:a ex:temp ex:hot .`, expect: [{ line: 4 }] },
    ],
  });
});

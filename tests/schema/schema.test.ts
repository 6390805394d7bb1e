import { describe, expect, it } from 'vitest';
import { graphFromKeys, GraphBuilder } from '../../src/graph/store.js';
import { loadSchema } from '../../src/schema/index.js';
import { runChecks } from '../../src/checks/index.js';
import { EX, turtle } from '../checks/helpers.js';

const RDFS = 'http://www.w3.org/2000/01/rdf-schema#';
const RDF_TYPE = 'http://www.w3.org/1999/02/22-rdf-syntax-ns#type';
const SUB = `${RDFS}subClassOf`;

describe('loadSchema', () => {
  it('maps schema terms to the data graph by key, and gives schema-only terms ids beyond the data', async () => {
    const data = await turtle(`\nex:a a ex:Employee ; ex:worksFor ex:b .`);
    const ontology = await turtle(`\nex:Employee rdfs:subClassOf ex:Person .\nex:worksFor rdfs:domain ex:Person .`, 'schema.ttl');
    const schema = loadSchema(data, [ontology]);
    const a = data.terms.id(`${EX}a`);
    const person = schema.id(`${EX}Person`);
    expect(person).toBeGreaterThanOrEqual(data.terms.size);
    expect(schema.key(person)).toBe(`${EX}Person`);
    expect(schema.typesOf(a).map((id) => schema.key(id)).sort()).toEqual([`${EX}Employee`, `${EX}Person`]);
    expect(schema.domainsOf(data.terms.id(`${EX}worksFor`)).map((id) => schema.key(id))).toEqual([`${EX}Person`]);
  });

  it('tolerates subclass cycles: every class in the cycle has the others as superclasses', () => {
    const g = graphFromKeys([
      [`${EX}A`, SUB, `${EX}B`],
      [`${EX}B`, SUB, `${EX}C`],
      [`${EX}C`, SUB, `${EX}A`],
      [`${EX}x`, RDF_TYPE, `${EX}B`],
    ]);
    const schema = loadSchema(g);
    const x = g.terms.id(`${EX}x`);
    expect(schema.typesOf(x).map((id) => schema.key(id)).sort()).toEqual([`${EX}A`, `${EX}B`, `${EX}C`]);
    expect(schema.issues.map((i) => i.code)).toEqual(['subclass-cycle']);
    expect(schema.issues[0]!.source).toEqual({ file: 'inline', line: expect.any(Number) as number });
  });

  it('a class hierarchy 1,000 levels deep: closure is complete and nothing hangs', () => {
    const b = new GraphBuilder();
    const f = b.addFile('deep.ttl');
    for (let i = 0; i < 1000; i++) b.addKeys(`${EX}C${i + 1}`, SUB, `${EX}C${i}`, undefined, f, i + 1);
    b.addKeys(`${EX}worksFor`, `${RDFS}domain`, `${EX}C0`, undefined, f, 1001);
    b.addKeys(`${EX}Other`, 'http://www.w3.org/2002/07/owl#disjointWith', `${EX}C0`, undefined, f, 1002);
    b.addKeys(`${EX}leaf`, RDF_TYPE, `${EX}C1000`, undefined, f, 1003);
    b.addKeys(`${EX}leaf`, `${EX}worksFor`, `${EX}x`, undefined, f, 1004);
    b.addKeys(`${EX}odd`, RDF_TYPE, `${EX}Other`, undefined, f, 1005);
    b.addKeys(`${EX}odd`, `${EX}worksFor`, `${EX}x`, undefined, f, 1006);
    const g = b.build();
    const started = performance.now();
    const schema = loadSchema(g);
    expect(schema.typesOf(g.terms.id(`${EX}leaf`))).toHaveLength(1001);
    const findings = runChecks(g, schema, { only: ['domain', 'disjoint-classes', 'schema'] });
    expect(findings.map((x) => [x.check, x.severity, x.subject, x.source?.line])).toEqual([['domain', 'error', `${EX}odd`, 1006]]);
    expect(performance.now() - started).toBeLessThan(20_000);
  });

  it('a 20,000-level hierarchy with one instance at the bottom: closure stays linear', () => {
    const b = new GraphBuilder();
    const f = b.addFile('deeper.ttl');
    for (let i = 0; i < 20_000; i++) b.addKeys(`${EX}C${i + 1}`, SUB, `${EX}C${i}`, undefined, f, i + 1);
    b.addKeys(`${EX}leaf`, RDF_TYPE, `${EX}C20000`, undefined, f, 20_001);
    const g = b.build();
    const schema = loadSchema(g);
    expect(schema.typesOf(g.terms.id(`${EX}leaf`))).toHaveLength(20_001);
    expect(schema.issues).toEqual([]);
  });

  it('axioms stated in the audited graph and in --schema files add up', async () => {
    const data = await turtle(`\nex:p rdfs:domain ex:A .\nex:x ex:p ex:y .`);
    const ontology = await turtle(`\nex:p rdfs:domain ex:B .`, 'schema.ttl');
    const schema = loadSchema(data, [ontology]);
    expect(schema.domainsOf(data.terms.id(`${EX}p`)).map((id) => schema.key(id)).sort()).toEqual([`${EX}A`, `${EX}B`]);
  });

  it('super-property domains are inherited, through chains and cycles of rdfs:subPropertyOf', async () => {
    const data = await turtle(`\nex:p1 rdfs:subPropertyOf ex:p2 .\nex:p2 rdfs:subPropertyOf ex:p3 .\nex:p3 rdfs:subPropertyOf ex:p2 .\nex:p3 rdfs:domain ex:D .\nex:p3 rdfs:range xsd:integer .\nex:a ex:p1 1 .`);
    const schema = loadSchema(data);
    const p1 = data.terms.id(`${EX}p1`);
    expect(schema.domainsOf(p1).map((id) => schema.key(id))).toEqual([`${EX}D`]);
    expect(schema.expectedObject(p1)).toBe('literal');
    expect(schema.issues.map((i) => i.code)).toEqual(['subproperty-cycle']);
  });

  it('conflicting literal and class ranges leave the expected object kind undecided', async () => {
    const data = await turtle(`\nex:p rdfs:range xsd:string, ex:Thing .\nex:a ex:p 1 .`);
    const schema = loadSchema(data);
    expect(schema.expectedObject(data.terms.id(`${EX}p`))).toBeUndefined();
  });
});

/**
 * RDF 1.1 Semantics (W3C Recommendation, 25 February 2014), §9.2.1, the table of RDFS entailment
 * patterns: rdfs2 (domain), rdfs3 (range), rdfs5 (subPropertyOf is transitive), rdfs7 (a triple holds
 * for the super-property), rdfs9 (instances of a subclass are instances of the class) and rdfs11
 * (subClassOf is transitive). plumb reads domain and range as requirements; the types it reports as
 * missing, with their superclasses (rdfs9 again), must be exactly those these rules would add and the
 * data does not already have by rdfs9/rdfs11.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { runChecks } from '../../src/checks/index.js';
import { graphFromKeys } from '../../src/graph/store.js';
import { loadSchema } from '../../src/schema/index.js';
import { EX } from '../checks/helpers.js';

const RDF_TYPE = 'http://www.w3.org/1999/02/22-rdf-syntax-ns#type';
const RDFS = 'http://www.w3.org/2000/01/rdf-schema#';
const DOMAIN = `${RDFS}domain`;
const RANGE = `${RDFS}range`;
const SUBCLASS = `${RDFS}subClassOf`;
const SUBPROP = `${RDFS}subPropertyOf`;

type Triple = [string, string, string];

/** Forward chaining of rdfs2, rdfs3, rdfs5, rdfs7, rdfs9, rdfs11 to a fixpoint, written from the table. */
function entail(triples: readonly Triple[], rules: ReadonlySet<string>): Set<string> {
  const all = new Set(triples.map((t) => t.join(' ')));
  const list = (): Triple[] => [...all].map((s) => s.split(' ') as Triple);
  for (let changed = true; changed; ) {
    changed = false;
    const ts = list();
    const add = (t: Triple): void => {
      const k = t.join(' ');
      if (!all.has(k)) {
        all.add(k);
        changed = true;
      }
    };
    for (const [a, p, x] of ts) {
      for (const [y, q, z] of ts) {
        if (rules.has('rdfs2') && p === DOMAIN && q === a) add([y, RDF_TYPE, x]);
        if (rules.has('rdfs3') && p === RANGE && q === a) add([z, RDF_TYPE, x]);
        if (rules.has('rdfs5') && p === SUBPROP && q === SUBPROP && y === x) add([a, SUBPROP, z]);
        if (rules.has('rdfs7') && p === SUBPROP && q === a) add([y, x, z]);
        if (rules.has('rdfs9') && p === SUBCLASS && q === RDF_TYPE && z === a) add([y, RDF_TYPE, x]);
        if (rules.has('rdfs11') && p === SUBCLASS && q === SUBCLASS && y === x) add([a, SUBCLASS, z]);
      }
    }
  }
  return all;
}

const ALL_RULES = new Set(['rdfs2', 'rdfs3', 'rdfs5', 'rdfs7', 'rdfs9', 'rdfs11']);
const typesIn = (closure: Set<string>, entity: string): string[] =>
  [...closure].filter((k) => k.startsWith(`${entity} ${RDF_TYPE} `)).map((k) => k.split(' ')[2]!).sort();

describe('RDF 1.1 Semantics §9.2.1 entailment patterns', () => {
  const ex = (l: string): string => EX + l;

  it('rdfs2: aaa rdfs:domain xxx . yyy aaa zzz . ⊨ yyy rdf:type xxx', () => {
    const g = graphFromKeys([[ex('aaa'), DOMAIN, ex('xxx')], [ex('yyy'), ex('aaa'), ex('zzz')]]);
    const schema = loadSchema(g);
    expect(schema.entailedTypes(g.terms.id(ex('yyy'))).map((id) => schema.key(id))).toEqual([ex('xxx')]);
    const [f] = runChecks(g, schema, { only: ['domain'] });
    expect([f?.subject, f?.evidence.missing]).toEqual([ex('yyy'), [ex('xxx')]]);
  });

  it('rdfs3: aaa rdfs:range xxx . yyy aaa zzz . ⊨ zzz rdf:type xxx', () => {
    const g = graphFromKeys([[ex('aaa'), RANGE, ex('xxx')], [ex('yyy'), ex('aaa'), ex('zzz')]]);
    const schema = loadSchema(g);
    expect(schema.entailedTypes(g.terms.id(ex('zzz'))).map((id) => schema.key(id))).toEqual([ex('xxx')]);
    const [f] = runChecks(g, schema, { only: ['range'] });
    expect([f?.object, f?.evidence.missing]).toEqual([ex('zzz'), [ex('xxx')]]);
  });

  it('rdfs9 and rdfs11: zzz rdf:type xxx . xxx ⊑ yyy ⊑ www ⊨ zzz rdf:type yyy, www', () => {
    const g = graphFromKeys([[ex('xxx'), SUBCLASS, ex('yyy')], [ex('yyy'), SUBCLASS, ex('www')], [ex('zzz'), RDF_TYPE, ex('xxx')]]);
    const schema = loadSchema(g);
    expect(schema.typesOf(g.terms.id(ex('zzz'))).map((id) => schema.key(id)).sort()).toEqual([ex('www'), ex('xxx'), ex('yyy')]);
    // A domain satisfied only through rdfs9/rdfs11 is satisfied.
    const g2 = graphFromKeys([[ex('xxx'), SUBCLASS, ex('yyy')], [ex('yyy'), SUBCLASS, ex('www')], [ex('zzz'), RDF_TYPE, ex('xxx')], [ex('p'), DOMAIN, ex('www')], [ex('zzz'), ex('p'), ex('o')]]);
    expect(runChecks(g2, loadSchema(g2), { only: ['domain'] })).toEqual([]);
  });

  it('rdfs5 and rdfs7 carry a domain down sub-property chains', () => {
    const g = graphFromKeys([[ex('p1'), SUBPROP, ex('p2')], [ex('p2'), SUBPROP, ex('p3')], [ex('p3'), DOMAIN, ex('D')], [ex('s'), ex('p1'), ex('o')]]);
    const schema = loadSchema(g);
    const closure = entail([[ex('p1'), SUBPROP, ex('p2')], [ex('p2'), SUBPROP, ex('p3')], [ex('p3'), DOMAIN, ex('D')], [ex('s'), ex('p1'), ex('o')]], ALL_RULES);
    expect(typesIn(closure, ex('s'))).toEqual([ex('D')]);
    expect(schema.entailedTypes(g.terms.id(ex('s'))).map((id) => schema.key(id))).toEqual([ex('D')]);
  });

  it('on random small graphs, domain and range findings name exactly the entailed types the data lacks', () => {
    const classes = ['A', 'B', 'C', 'D', 'E'].map(ex);
    const props = ['p', 'q', 'r', 's'].map(ex);
    const entities = ['e1', 'e2', 'e3', 'e4', 'e5', 'e6'].map(ex);
    const axiom = fc.oneof(
      fc.tuple(fc.constantFrom(...props), fc.constant(DOMAIN), fc.constantFrom(...classes)),
      fc.tuple(fc.constantFrom(...props), fc.constant(RANGE), fc.constantFrom(...classes)),
      fc.tuple(fc.constantFrom(...classes), fc.constant(SUBCLASS), fc.constantFrom(...classes)),
      fc.tuple(fc.constantFrom(...props), fc.constant(SUBPROP), fc.constantFrom(...props)),
    );
    const fact = fc.oneof(
      fc.tuple(fc.constantFrom(...entities), fc.constantFrom(...props), fc.constantFrom(...entities)),
      fc.tuple(fc.constantFrom(...entities), fc.constant(RDF_TYPE), fc.constantFrom(...classes)),
    );
    fc.assert(
      fc.property(fc.array(axiom, { maxLength: 8 }), fc.array(fact, { minLength: 1, maxLength: 10 }), (axioms, facts) => {
        const triples = [...axioms, ...facts] as Triple[];
        const g = graphFromKeys(triples);
        const schema = loadSchema(g);
        const findings = runChecks(g, schema, { only: ['domain', 'range'] });
        // Types the data has without domain/range: rdfs9/rdfs11 (and rdfs5/rdfs7, which add no types).
        const asserted = entail(triples, new Set(['rdfs5', 'rdfs7', 'rdfs9', 'rdfs11']));
        const everything = entail(triples, ALL_RULES);
        for (const entity of entities) {
          const missing = typesIn(everything, entity).filter((c) => !typesIn(asserted, entity).includes(c));
          const has = new Set(typesIn(asserted, entity));
          const reported = new Set<string>();
          for (const f of findings.filter((x) => (x.check === 'domain' ? x.subject : x.object) === entity)) {
            for (const c of f.evidence.missing as string[]) {
              // Stating the missing class would also state its superclasses (rdfs9).
              for (const sup of [c, ...[...everything].filter((k) => k.startsWith(`${c} ${SUBCLASS} `)).map((k) => k.split(' ')[2]!)]) {
                if (!has.has(sup)) reported.add(sup);
              }
            }
          }
          expect([...reported].sort()).toEqual(missing);
        }
      }),
      { numRuns: 150, seed: 20140225 },
    );
  });
});

/**
 * All checks over generated graphs of 250k, 500k and 1M triples with a 200-axiom ontology and 50
 * SHACL shapes: time (median of 3) and findings, per size, and the ratio to the 250k time, which is
 * 2 and 4 when the checks are linear. Goal: under 10 s at 1M. The graphs are built directly with
 * GraphBuilder, so reading is not timed. The machine is shared: wall time depends on what else runs,
 * so the process's own CPU time (user + system, one thread) is printed beside it, with the load average. `npx tsx tests/bench/checks.ts` or `npm run bench -- checks`.
 */
import os from 'node:os';
import { pathToFileURL } from 'node:url';
import { runChecks, ALL_CHECKS } from '../../src/checks/index.js';
import type { Finding } from '../../src/findings.js';
import { GraphBuilder, type Graph } from '../../src/graph/store.js';
import { literalKey } from '../../src/graph/terms.js';
import { loadSchema } from '../../src/schema/index.js';

const NS = 'http://bench.example/';
const RDF = 'http://www.w3.org/1999/02/22-rdf-syntax-ns#';
const RDFS = 'http://www.w3.org/2000/01/rdf-schema#';
const OWL = 'http://www.w3.org/2002/07/owl#';
const XSD = 'http://www.w3.org/2001/XMLSchema#';
const SH = 'http://www.w3.org/ns/shacl#';

/** Mulberry32: a small seeded generator, so every run builds the same graphs. */
function random(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const CLASSES = 40;
const OBJECT_PROPS = 30;
const DATA_PROPS = 10;
const cls = (i: number): string => `${NS}C${i}`;
const op = (i: number): string => `${NS}op${i}`;
const dp = (i: number): string => `${NS}dp${i}`;
/** Class i's parent in a ternary tree: C0 is the root. */
const parent = (i: number): number => Math.floor((i - 1) / 3);
const leaves = Array.from({ length: CLASSES }, (_, i) => i).filter((i) => 3 * i + 1 >= CLASSES);
const DATATYPES = ['integer', 'decimal', 'date', 'boolean', 'string'];

/** The ontology as [s, p, o] keys: exactly 200 axioms. Property i has its domain in branch i % 3 and its range in branch (i + 1) % 3. */
function ontology(): Array<[string, string, string]> {
  const out: Array<[string, string, string]> = [];
  for (let i = 1; i < CLASSES; i++) out.push([cls(i), `${RDFS}subClassOf`, cls(parent(i))]); // 39
  for (let i = 0; i < OBJECT_PROPS; i++) {
    out.push([op(i), `${RDFS}domain`, cls(1 + (i % 3))]); // 30
    out.push([op(i), `${RDFS}range`, cls(1 + ((i + 1) % 3))]); // 30
  }
  for (let i = 0; i < DATA_PROPS; i++) {
    out.push([dp(i), `${RDFS}domain`, cls(1 + (i % 3))]); // 10
    out.push([dp(i), `${RDFS}range`, `${XSD}${DATATYPES[i % DATATYPES.length]}`]); // 10
  }
  for (let i = 0; i < 15; i++) out.push([op(i), `${RDF}type`, `${OWL}FunctionalProperty`]); // 15
  for (let i = 0; i < DATA_PROPS; i++) out.push([dp(i), `${RDF}type`, `${OWL}FunctionalProperty`]); // 10
  for (let i = 15; i < 19; i++) out.push([op(i), `${RDF}type`, `${OWL}InverseFunctionalProperty`]); // 4
  out.push([dp(9), `${RDF}type`, `${OWL}InverseFunctionalProperty`]); // 1
  for (let i = 0; i < 15; i++) out.push([op(i), `${RDF}type`, `${OWL}ObjectProperty`]); // 15
  for (let i = 20; i < 25; i++) out.push([op(i), `${RDF}type`, `${OWL}IrreflexiveProperty`]); // 5
  for (let i = 25; i < 30; i++) out.push([op(i), `${RDF}type`, `${OWL}AsymmetricProperty`]); // 5
  out.push([cls(1), `${OWL}disjointWith`, cls(2)], [cls(2), `${OWL}disjointWith`, cls(3)], [cls(1), `${OWL}disjointWith`, cls(3)]); // 3
  for (let i = 0; i < 23; i++) out.push([`${NS}sub${i}`, `${RDFS}subPropertyOf`, op(20 + (i % 10))]); // 23
  return out;
}

/** 50 shapes: 10 node shapes, one per branch in turn, each with 4 property shapes on that branch's properties. */
function shapes(): Array<[string, string, string]> {
  const out: Array<[string, string, string]> = [];
  let blank = 0;
  const int = (n: number): string => literalKey(String(n), `${XSD}integer`);
  for (let i = 0; i < 10; i++) {
    const branch = i % 3;
    const shape = `${NS}Shape${i}`;
    out.push([shape, `${RDF}type`, `${SH}NodeShape`], [shape, `${SH}targetClass`, cls(1 + branch)]);
    for (let k = 0; k < 4; k++) {
      const ps = `_:s${blank++}`;
      out.push([shape, `${SH}property`, ps]);
      if (k < 2) {
        const d = (branch + 3 * ((i + k) % 3)) % DATA_PROPS; // a data property of this branch
        const type = DATATYPES[d % DATATYPES.length]!;
        out.push([ps, `${SH}path`, dp(d)], [ps, `${SH}maxCount`, int(1)], [ps, `${SH}minCount`, int(1)], [ps, `${SH}datatype`, `${XSD}${type}`]);
        if (type === 'integer') out.push([ps, `${SH}minInclusive`, int(0)], [ps, `${SH}maxExclusive`, int(100)]);
        if (type === 'string') out.push([ps, `${SH}pattern`, literalKey('^[a-z]+-?[0-9]*$')], [ps, `${SH}minLength`, int(2)]);
      } else {
        const o = branch + 3 * ((i * 2 + k) % 10); // an object property of this branch
        out.push([ps, `${SH}path`, op(o)], [ps, `${SH}class`, cls(1 + ((o + 1) % 3))], [ps, `${SH}nodeKind`, `${SH}IRI`]);
        if (o < 15) out.push([ps, `${SH}maxCount`, int(1)]);
      }
    }
  }
  return out;
}

function value(s: number, p: number, type: string, r: () => number): string {
  if (p === 9) return literalKey(`id-${s}`); // inverse-functional: one value per subject
  switch (type) {
    case 'integer':
      return literalKey(String(Math.floor(r() * 100)), `${XSD}integer`);
    case 'decimal':
      return literalKey((r() * 100).toFixed(2), `${XSD}decimal`);
    case 'date':
      return literalKey(`20${10 + (s % 15)}-0${1 + (s % 9)}-1${s % 10}`, `${XSD}date`);
    case 'boolean':
      return literalKey(s % 2 ? 'true' : 'false', `${XSD}boolean`);
    default:
      return literalKey(`name${s % 1000}`);
  }
}

/**
 * A graph of about `size` triples (each entity gets about ten): entities typed with a leaf class,
 * each data property of its branch once, six object properties of its branch with one value each
 * (two for some non-functional ones), objects of the range branch; and about 1% planted errors of
 * every kind the checks look for (wrong-branch objects, reflexive and reversed links, extra values
 * of functional properties, ill-typed literals, resources for literals, shared identifiers).
 */
export function generate(size: number, seed = 7): Graph {
  const r = random(seed);
  const b = new GraphBuilder();
  const file = b.addFile('bench.nt');
  let line = 0;
  const add = (s: string, p: string, o: string): void => {
    b.addKeys(s, p, o, undefined, file, ++line);
  };
  for (const [s, p, o] of ontology()) add(s, p, o);
  const entities = Math.max(100, Math.floor(size / 10.4));
  const byBranch: number[][] = [[], [], []];
  const position = new Int32Array(entities);
  const branchOf = (c: number): number => {
    while (parent(c) !== 0) c = parent(c);
    return c - 1;
  };
  const ent = (i: number): string => `${NS}e${i}`;
  const classOf = new Int32Array(entities);
  for (let i = 0; i < entities; i++) {
    const c = leaves[Math.floor(r() * leaves.length)]!;
    classOf[i] = c;
    const branch = branchOf(c);
    position[i] = byBranch[branch]!.length;
    byBranch[branch]!.push(i);
  }
  const pick = (branch: number): number => {
    const list = byBranch[branch]!;
    return list[Math.floor(r() * list.length)]!;
  };
  for (let s = 0; s < entities; s++) add(ent(s), `${RDF}type`, cls(classOf[s]!));
  for (let s = 0; s < entities && b.size < size; s++) {
    const branch = branchOf(classOf[s]!);
    const err = (): boolean => r() < 0.01;
    for (let d = branch; d < DATA_PROPS; d += 3) {
      const type = DATATYPES[d % DATATYPES.length]!;
      let o = value(s, d, type, r);
      if (err()) o = r() < 0.5 ? literalKey('n/a', `${XSD}${type === 'string' ? 'integer' : type}`) : ent(pick(0));
      add(ent(s), dp(d), o);
      if (err()) add(ent(s), dp(d), value(s + 1, d, type, r));
    }
    const props = Array.from({ length: 10 }, (_, k) => branch + 3 * k).sort(() => r() - 0.5).slice(0, 6);
    for (const p of props) {
      const range = (p + 1) % 3;
      let o: number;
      if (p >= 15 && p < 19) {
        // inverse-functional: an injective choice of object
        const list = byBranch[range]!;
        if (position[s]! >= list.length) continue;
        o = list[position[s]!]!;
      } else o = pick(range);
      if (err()) o = r() < 0.3 ? pick(branch) : r() < 0.5 && p >= 20 ? s : pick((range + 1) % 3);
      // Some links of the irreflexive and asymmetric properties go through their sub-properties.
      add(ent(s), p >= 20 && r() < 0.2 ? `${NS}sub${p - 20}` : op(p), ent(o));
      if (p >= 25 && err()) add(ent(o), op(p), ent(s));
      if (p < 15 && err()) add(ent(s), op(p), ent(pick(range)));
      else if (p >= 19 && r() < 0.2) add(ent(s), op(p), ent(pick(range)));
    }
  }
  return b.build();
}

export function shapesGraph(): Graph {
  const b = new GraphBuilder();
  const file = b.addFile('shapes.ttl');
  shapes().forEach(([s, p, o], i) => b.addKeys(s, p, o, undefined, file, i + 1));
  return b.build();
}

function byCheck(findings: readonly Finding[]): string {
  const counts = new Map<string, number>();
  for (const f of findings) counts.set(f.check, (counts.get(f.check) ?? 0) + 1);
  return [...counts].sort().map(([k, n]) => `${k} ${n}`).join(', ');
}

export async function run(): Promise<void> {
  const shapeGraph = shapesGraph();
  console.log(`ontology: ${ontology().length} axioms; shapes: ${loadSchema(generate(1000), [], [shapeGraph]).shapes.length} shapes; checks: ${ALL_CHECKS.length}`);
  // One untimed run first, so that the 250k figure does not carry the JIT's warm-up.
  const warm = generate(100_000);
  runChecks(warm, loadSchema(warm, [], [shapeGraph]));
  const rows: Array<{ size: number; ms: number; cpu: number }> = [];
  for (const size of [250_000, 500_000, 1_000_000]) {
    const graph = generate(size);
    const times: number[] = [];
    const cpus: number[] = [];
    let findings: Finding[] = [];
    const perCheck = new Map<string, number[]>();
    for (let rep = 0; rep < 3; rep++) {
      const cpu0 = process.cpuUsage();
      const started = performance.now();
      const schema = loadSchema(graph, [], [shapeGraph]);
      perCheck.set('(loadSchema)', [...(perCheck.get('(loadSchema)') ?? []), performance.now() - started]);
      let last = performance.now();
      findings = runChecks(graph, schema, {}, (e) => {
        const now = performance.now();
        if (e.detail !== undefined || e.done === e.total) {
          const prev = ALL_CHECKS[e.done - 1]?.meta.id;
          if (prev) perCheck.set(prev, [...(perCheck.get(prev) ?? []), now - last]);
        }
        last = now;
      });
      times.push(performance.now() - started);
      const cpu = process.cpuUsage(cpu0);
      cpus.push((cpu.user + cpu.system) / 1000);
    }
    times.sort((a, b) => a - b);
    cpus.sort((a, b) => a - b);
    const ms = times[1]!;
    const cpu = cpus[1]!;
    rows.push({ size, ms, cpu });
    const slow = [...perCheck].map(([id, t]) => [id, t.sort((a, b) => a - b)[1] ?? t[0]!] as const).sort((a, b) => b[1] - a[1]).slice(0, 5);
    console.log(
      `${graph.size.toLocaleString('en')} triples: median wall ${(ms / 1000).toFixed(2)} s (runs ${times.map((t) => (t / 1000).toFixed(2)).join(', ')}), ` +
        `CPU ${(cpu / 1000).toFixed(2)} s, load average ${os.loadavg()[0]!.toFixed(1)} on ${os.cpus().length} cores, ` +
        `${findings.length.toLocaleString('en')} findings [${byCheck(findings)}]`,
    );
    console.log(`  slowest checks: ${slow.map(([id, t]) => `${id} ${(t / 1000).toFixed(2)} s`).join(', ')}`);
  }
  const base = rows[0]!;
  console.log(`ratio to 250k (linear: 2, 4): wall ${rows.map((r) => (r.ms / base.ms).toFixed(2)).join(', ')}; CPU ${rows.map((r) => (r.cpu / base.cpu).toFixed(2)).join(', ')}`);
  const last = rows[2]!;
  console.log(`goal: under 10 s at 1M triples — wall ${(last.ms / 1000).toFixed(2)} s ${last.ms < 10_000 ? 'met' : 'NOT met'}, CPU ${(last.cpu / 1000).toFixed(2)} s ${last.cpu < 10_000 ? 'met' : 'NOT met'}`);
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) await run();

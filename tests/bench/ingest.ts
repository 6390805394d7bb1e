/**
 * Ingest benchmark: plumb's reader and store against `n3`'s parser alone on the same generated
 * N-Triples file, plus the memory the finished store holds.
 *
 *   npx tsx tests/bench/ingest.ts          (or `npm run bench -- ingest`)
 *   PLUMB_BENCH_TRIPLES=500000 npx tsx tests/bench/ingest.ts   (a smaller file)
 *
 * Method.
 * - The file (≥ 2 M triples by default) is generated once into the OS temp folder with a fixed seed
 *   (see {@link generate}): typical IRIs (`https://data.example.org/entity/E123456`), ~10 triples
 *   per entity grouped by subject, skewed predicates and objects.
 * - Floor: `new n3.Parser().parse(fs.createReadStream(file), onQuad)` counting quads, nothing else.
 * - plumb: `readGraph([file])`: decode, split lines, parse with n3, intern terms, drop duplicates,
 *   record provenance, then build the CSR indexes. Everything the caller gets.
 * - Runs alternate (floor, plumb, floor, plumb, …) so that load from other processes on a shared
 *   machine hits both alike; the figures are medians of at least 3 runs each, in wall time and in
 *   CPU time of the process (user + system, all threads), and the ratio is taken on each.
 * - Memory: after a full garbage collection (V8's `gc`, exposed at run time), the growth of V8 heap
 *   plus array-buffer bytes from before the read to after it, with the graph alive, divided by the
 *   triples: the resident cost of dictionary + columns + provenance + indexes. The peak during the
 *   read (sampled every 20 ms) shows that reading streams: it stays far below the file's size.
 */
import { createReadStream, createWriteStream, existsSync, statSync } from 'node:fs';
import os from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';
import { Parser } from 'n3';
import { readGraph } from '../../src/sources/index.js';

const TRIPLES = Number(process.env.PLUMB_BENCH_TRIPLES ?? 2_000_000);
const RUNS = Math.max(3, Number(process.env.PLUMB_BENCH_RUNS ?? 3));

setFlagsFromString('--expose-gc');
const gc = runInNewContext('gc') as () => void;

/** A deterministic linear congruential generator (common practice; quality is irrelevant here). */
function lcg(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    return state / 2 ** 32;
  };
}

/**
 * Writes a graph shaped like a typical dump: triples grouped by subject (as stores and serialisers
 * write them), each entity with its rdf:type, a language-tagged label, sometimes an integer, and
 * ~7 relations. Relation predicates (80) and objects are skewed as in real graphs — a few are very
 * common: the object is entity ⌊E·u³⌋ for uniform u, so rank r has frequency ∝ r^(-2/3).
 */
export async function generate(path: string, triples: number): Promise<void> {
  const entities = Math.max(1, Math.floor(triples / 10));
  const base = 'https://data.example.org/';
  const rdfType = '<http://www.w3.org/1999/02/22-rdf-syntax-ns#type>';
  const label = '<http://www.w3.org/2000/01/rdf-schema#label>';
  const integer = '<http://www.w3.org/2001/XMLSchema#integer>';
  const random = lcg(20240601);
  const out = createWriteStream(path);
  let buffer = '';
  let written = 0;
  for (let e = 0; written < triples; e++) {
    const subject = `<${base}entity/E${e}>`;
    const group = Math.min(triples - written, 7 + Math.floor(random() * 7));
    for (let k = 0; k < group; k++) {
      if (k === 0)
        buffer += `${subject} ${rdfType} <${base}ontology/Class${Math.floor(random() * random() * 40)}> .\n`;
      else if (k === 1) buffer += `${subject} ${label} "Item ${e} of the catalogue"@en .\n`;
      else if (k === 2 && random() < 0.5)
        buffer += `${subject} <${base}ontology/count${e % 5}> "${Math.floor(random() * 100_000)}"^^${integer} .\n`;
      else {
        const predicate = Math.floor(random() * random() * 80);
        const object = Math.floor(entities * random() ** 3);
        buffer += `${subject} <${base}ontology/relation${predicate}> <${base}entity/E${object}> .\n`;
      }
    }
    written += group;
    if (buffer.length > 1 << 16) {
      if (!out.write(buffer)) await new Promise<void>((resolve) => out.once('drain', () => resolve()));
      buffer = '';
    }
  }
  out.end(buffer);
  await new Promise<void>((resolve, reject) => out.on('finish', () => resolve()).on('error', reject));
}

interface Timing {
  wall: number;
  cpu: number;
}

async function timed(work: () => Promise<number>): Promise<Timing & { count: number }> {
  gc();
  const cpu0 = process.cpuUsage();
  const t0 = performance.now();
  const count = await work();
  const wall = (performance.now() - t0) / 1000;
  const cpu = process.cpuUsage(cpu0);
  return { wall, cpu: (cpu.user + cpu.system) / 1e6, count };
}

function n3Alone(path: string): Promise<number> {
  return new Promise((resolve, reject) => {
    let count = 0;
    new Parser({ format: 'N-Triples' }).parse(
      createReadStream(path, { highWaterMark: 1 << 18 }),
      (error, quad) => {
        if (error) reject(error);
        else if (quad) count++;
        else resolve(count);
      },
    );
  });
}

async function plumbIngest(path: string): Promise<number> {
  const { accounting } = await readGraph([path]);
  return accounting.read;
}

const median = (xs: number[]): number => {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
};

const fmt = (n: number): string => Math.round(n).toLocaleString('en');

export async function run(): Promise<void> {
  const path = join(os.tmpdir(), `plumb-bench-ingest-v2-${TRIPLES}.nt`);
  if (!existsSync(path)) {
    console.log(`generating ${fmt(TRIPLES)} triples into ${path} …`);
    await generate(path, TRIPLES);
  }
  const fileBytes = statSync(path).size;
  console.log(`file: ${path}, ${fmt(TRIPLES)} triples, ${(fileBytes / 2 ** 20).toFixed(0)} MiB`);

  const floor: Timing[] = [];
  const ours: Timing[] = [];
  for (let r = 0; r < RUNS; r++) {
    const a = await timed(() => n3Alone(path));
    floor.push(a);
    const b = await timed(() => plumbIngest(path));
    ours.push(b);
    if (a.count !== TRIPLES || b.count !== TRIPLES)
      throw new Error(`counted ${a.count} / ${b.count} triples, expected ${TRIPLES}`);
    console.log(
      `run ${r + 1}: n3 alone ${a.wall.toFixed(2)} s wall / ${a.cpu.toFixed(2)} s cpu; plumb ${b.wall.toFixed(2)} s wall / ${b.cpu.toFixed(2)} s cpu`,
    );
  }
  const floorWall = median(floor.map((t) => t.wall));
  const oursWall = median(ours.map((t) => t.wall));
  const floorCpu = median(floor.map((t) => t.cpu));
  const oursCpu = median(ours.map((t) => t.cpu));
  console.log(
    `n3 parser alone : ${fmt(TRIPLES / floorWall)} triples/s (median wall ${floorWall.toFixed(2)} s; cpu ${floorCpu.toFixed(2)} s)`,
  );
  console.log(
    `plumb ingest    : ${fmt(TRIPLES / oursWall)} triples/s (median wall ${oursWall.toFixed(2)} s; cpu ${oursCpu.toFixed(2)} s)`,
  );
  console.log(
    `ratio plumb/n3  : ${(oursWall / floorWall).toFixed(2)}× wall, ${(oursCpu / floorCpu).toFixed(2)}× cpu (goal ≤ 1.30×)`,
  );

  // Memory of the finished store, with the graph alive.
  gc();
  const before = process.memoryUsage();
  let peak = 0;
  const sampler = setInterval(() => {
    const m = process.memoryUsage();
    peak = Math.max(peak, m.heapUsed + m.arrayBuffers - before.heapUsed - before.arrayBuffers);
  }, 20);
  const result = await readGraph([path]);
  clearInterval(sampler);
  gc();
  const after = process.memoryUsage();
  const held = after.heapUsed + after.arrayBuffers - before.heapUsed - before.arrayBuffers;
  const { graph } = result;
  const columns = [graph.s, graph.p, graph.o, graph.g, graph.provenance.file, graph.provenance.line].reduce(
    (n, a) => n + a.byteLength,
    0,
  );
  const indexes = [graph.bySubject, graph.byObject, graph.byPredicate].reduce(
    (n, c) => n + c.offsets.byteLength + c.triples.byteLength,
    0,
  );
  console.log(
    `store: ${fmt(graph.size)} triples, ${fmt(graph.terms.size)} distinct terms; ` +
      `columns + provenance ${(columns / graph.size).toFixed(1)} B/triple, CSR indexes ${(indexes / graph.size).toFixed(1)} B/triple, ` +
      `dictionary ≈ ${((held - columns - indexes) / graph.size).toFixed(1)} B/triple (${((held - columns - indexes) / graph.terms.size).toFixed(0)} B/term)`,
  );
  console.log(
    `resident bytes per triple, all in: ${(held / graph.size).toFixed(1)} (goal ≤ 80); rss ${(after.rss / 2 ** 20).toFixed(0)} MiB`,
  );
  console.log(
    `peak growth while reading: ${(Math.max(peak, held) / 2 ** 20).toFixed(0)} MiB for a ${(fileBytes / 2 ** 20).toFixed(0)} MiB file (streams: grows with terms, not bytes)`,
  );
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) await run();

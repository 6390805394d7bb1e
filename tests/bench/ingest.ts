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
 *   triples: the resident cost of dictionary + columns + provenance + indexes. It is measured first,
 *   before the timing runs, because freed array buffers are returned to the OS lazily.
 * - Streaming: a file of as many lines over only 1,000 distinct triples is read while memory is
 *   sampled every 20 ms; its peak growth stays a few MiB whatever the file's size.
 * - A third contender, n3 plus interning every term into the dictionary and nothing else, bounds
 *   from below what any reader that gives terms exact integer ids costs on the machine, and the
 *   pointer-chasing latency printed beside it says why: each lookup in a dictionary of hundreds of
 *   thousands of terms is a few dependent cache misses.
 */
import { createReadStream, createWriteStream, existsSync, statSync } from 'node:fs';
import os from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';
import { Parser } from 'n3';
import { TermDictionary } from '../../src/graph/terms.js';
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

/** `triples` lines cycling over 1,000 distinct triples of typical IRIs. */
async function generateRepeats(path: string, triples: number): Promise<void> {
  const lines = Array.from(
    { length: 1000 },
    (_, i) =>
      `<https://data.example.org/entity/E${i}> <https://data.example.org/ontology/relation${i % 80}> <https://data.example.org/entity/E${(i * 7919) % 1000}> .\n`,
  ).join('');
  const out = createWriteStream(path);
  for (let written = 0; written < triples; written += 1000) {
    if (!out.write(lines)) await new Promise<void>((resolve) => out.once('drain', () => resolve()));
  }
  out.end();
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

/**
 * The floor plus exact interning of every term into a {@link TermDictionary} and nothing else: the
 * least any reader that maps terms to ids must do. Its ratio to the floor shows how much of plumb's
 * overhead is the dictionary itself on this machine.
 */
function n3WithDictionary(path: string): Promise<number> {
  const terms = new TermDictionary();
  return new Promise((resolve, reject) => {
    let count = 0;
    new Parser({ format: 'N-Triples' }).parse(
      createReadStream(path, { highWaterMark: 1 << 18 }),
      (error, quad) => {
        if (error) reject(error);
        else if (quad) {
          count++;
          terms.intern(quad.subject.value);
          terms.intern(quad.predicate.value);
          terms.intern(quad.object.termType === 'Literal' ? quad.object.id : quad.object.value);
        } else resolve(count);
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

/** Nanoseconds per dependent random load in working sets of 1, 8 and 32 MiB: what a hash lookup pays per cache miss. */
function latency(): string {
  const parts: string[] = [];
  for (const mib of [1, 8, 32]) {
    const n = (mib * 2 ** 20) / 4;
    const next = new Int32Array(n);
    const order = Int32Array.from({ length: n }, (_, i) => i);
    const random = lcg(mib);
    for (let i = n - 1; i > 0; i--) {
      const j = Math.floor(random() * (i + 1));
      const t = order[i]!;
      order[i] = order[j]!;
      order[j] = t;
    }
    for (let i = 0; i < n; i++) next[order[i]!] = order[(i + 1) % n]!;
    const steps = 2_000_000;
    let at = 0;
    const t0 = process.cpuUsage();
    for (let i = 0; i < steps; i++) at = next[at]!;
    const used = process.cpuUsage(t0);
    parts.push(`${mib} MiB ${(((used.user + used.system) * 1000) / steps).toFixed(0)} ns${at < 0 ? '' : ''}`);
  }
  return parts.join(', ');
}

/** Full collections with pauses between, so concurrent sweeping has returned what it frees. */
async function settle(): Promise<void> {
  for (let i = 0; i < 3; i++) {
    gc();
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

export async function run(): Promise<void> {
  const path = join(os.tmpdir(), `plumb-bench-ingest-v2-${TRIPLES}.nt`);
  if (!existsSync(path)) {
    console.log(`generating ${fmt(TRIPLES)} triples into ${path} …`);
    await generate(path, TRIPLES);
  }
  const fileBytes = statSync(path).size;
  console.log(`file: ${path}, ${fmt(TRIPLES)} triples, ${(fileBytes / 2 ** 20).toFixed(0)} MiB`);

  // Memory first, in a heap that has held nothing big yet: freed array buffers are returned lazily,
  // so measuring after the timing runs would credit their memory to the store.
  await settle();
  const before = process.memoryUsage();
  let peak = 0;
  const sampler = setInterval(() => {
    const m = process.memoryUsage();
    peak = Math.max(peak, m.heapUsed + m.arrayBuffers - before.heapUsed - before.arrayBuffers);
  }, 20);
  const result = await readGraph([path]);
  clearInterval(sampler);
  await settle();
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
  const dictionary = held - columns - indexes;
  console.log(
    `store: ${fmt(graph.size)} triples, ${fmt(graph.terms.size)} distinct terms; ` +
      `columns + provenance ${(columns / graph.size).toFixed(1)} B/triple, CSR indexes ${(indexes / graph.size).toFixed(1)} B/triple, ` +
      `dictionary (the rest) ${(dictionary / graph.size).toFixed(1)} B/triple = ${(dictionary / graph.terms.size).toFixed(0)} B/term`,
  );
  console.log(
    `resident bytes per triple, all in: ${(held / graph.size).toFixed(1)} (goal ≤ 80); ` +
      `rss grew ${((after.rss - before.rss) / graph.size).toFixed(1)} B/triple`,
  );
  console.log(
    `peak growth while reading: ${(Math.max(peak, held) / 2 ** 20).toFixed(0)} MiB for a ${(fileBytes / 2 ** 20).toFixed(0)} MiB file (streams: grows with terms, not bytes)`,
  );
  (result as { graph?: unknown }).graph = undefined;
  await settle();

  // Streaming: the same number of lines over only 1,000 distinct triples. Memory should stay flat.
  const repeats = join(os.tmpdir(), `plumb-bench-ingest-repeats-${TRIPLES}.nt`);
  if (!existsSync(repeats)) await generateRepeats(repeats, TRIPLES);
  const base = process.memoryUsage();
  let repeatPeak = 0;
  const repeatSampler = setInterval(() => {
    const m = process.memoryUsage();
    repeatPeak = Math.max(repeatPeak, m.heapUsed + m.arrayBuffers - base.heapUsed - base.arrayBuffers);
  }, 20);
  const repeated = await readGraph([repeats]);
  clearInterval(repeatSampler);
  console.log(
    `streaming check: ${fmt(repeated.accounting.read)} lines, ${fmt(repeated.graph.size)} distinct triples, ` +
      `${(statSync(repeats).size / 2 ** 20).toFixed(0)} MiB file: peak growth ${(repeatPeak / 2 ** 20).toFixed(0)} MiB (sampled every 20 ms)`,
  );
  await settle();

  const floor: Timing[] = [];
  const ours: Timing[] = [];
  const dictionaryOnly: Timing[] = [];
  for (let r = 0; r < RUNS; r++) {
    const a = await timed(() => n3Alone(path));
    floor.push(a);
    const b = await timed(() => plumbIngest(path));
    ours.push(b);
    const c = await timed(() => n3WithDictionary(path));
    dictionaryOnly.push(c);
    if (a.count !== TRIPLES || b.count !== TRIPLES || c.count !== TRIPLES)
      throw new Error(`counted ${a.count} / ${b.count} / ${c.count} triples, expected ${TRIPLES}`);
    console.log(
      `run ${r + 1}: n3 alone ${a.wall.toFixed(2)} s wall / ${a.cpu.toFixed(2)} s cpu; plumb ${b.wall.toFixed(2)} s / ${b.cpu.toFixed(2)} s; ` +
        `n3 + dictionary only ${c.wall.toFixed(2)} s / ${c.cpu.toFixed(2)} s`,
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
  const dictWall = median(dictionaryOnly.map((t) => t.wall));
  const dictCpu = median(dictionaryOnly.map((t) => t.cpu));
  console.log(
    `n3 + dictionary only (lower bound for exact term ids): ${(dictWall / floorWall).toFixed(2)}× wall, ${(dictCpu / floorCpu).toFixed(2)}× cpu`,
  );
  console.log(`pointer-chasing latency here: ${latency()}`);
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) await run();

/**
 * How long the fixture generators take: the demo scenario at scale 0.2 and 1, and the WordNet graph.
 * Medians of a few runs (the machine is shared; single runs are noisy).
 */
import { generateDemo } from '../../fixtures/demo/generate.js';
import { buildWordNetTriples } from '../../fixtures/wordnet/build.js';

async function median(runs: number, f: () => unknown): Promise<number> {
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    await f();
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(times.length / 2)] ?? Number.NaN;
}

export async function run(): Promise<void> {
  for (const scale of [0.2, 1]) {
    const d = generateDemo({ scale });
    const ms = await median(5, () => generateDemo({ scale, seed: 11 }));
    console.log(`demo scale ${scale}: ${d.base.split('\n').length - 1} base + ${d.incoming.split('\n').length - 1} incoming triples, median ${ms.toFixed(0)} ms`);
  }
  for (const preset of ['all', 'wn18rr-like'] as const) {
    let size = 0;
    const ms = await median(3, async () => {
      size = (await buildWordNetTriples({ preset })).length;
    });
    console.log(`wordnet ${preset}: ${size} triples, median ${ms.toFixed(0)} ms`);
  }
}

import { mkdtemp, readdir, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { graphFromKeys, type Graph } from '../../src/graph/store.js';
import { fit, loadModel } from '../../src/model/index.js';
import type { TrainedModel } from '../../src/model/types.js';
import { groupedGraph } from './synthetic.js';

const graph = groupedGraph({ triples: 300 });
let dir: string;
let model: TrainedModel;

function triplesOf(g: Graph): [string, string, string][] {
  return Array.from({ length: g.size }, (_, t) => [g.terms.key(g.s[t]!), g.terms.key(g.p[t]!), g.terms.key(g.o[t]!)]);
}

beforeAll(async () => {
  dir = await mkdtemp(path.join(tmpdir(), 'plumb-checkpoint-'));
  model = await fit(graph, { backend: 'wasm', dim: 8, epochs: 3, seed: 5 });
});

afterAll(async () => {
  model.dispose();
  await rm(dir, { recursive: true, force: true });
});

const queries = { s: Int32Array.of(0, 5, 9), r: Int32Array.of(0, 1, 2) };

describe('checkpoints', () => {
  it('round-trips: the loaded model scores exactly as the fitted one, on the same graph or without one', async () => {
    const target = path.join(dir, 'model');
    await model.save(target);
    expect((await readdir(target)).sort()).toEqual(['entities.txt', 'model.json', 'weights.bin']);
    const expected = await model.scoreObjects(queries.s, queries.r);
    for (const loaded of [await loadModel(target, graph), await loadModel(target)]) {
      expect(Array.from(await loaded.scoreObjects(queries.s, queries.r))).toEqual(Array.from(expected));
      expect(loaded.config).toEqual(model.config);
      expect(loaded.history).toEqual(model.history);
      loaded.dispose();
    }
  });

  it('replaces an earlier model atomically and leaves no temporary directory behind', async () => {
    const target = path.join(dir, 'replaced');
    await model.save(target);
    const other = await fit(graph, { backend: 'wasm', dim: 8, epochs: 1, seed: 9 });
    await other.save(target);
    const loaded = await loadModel(target, graph);
    expect(Array.from(await loaded.scoreObjects(queries.s, queries.r))).toEqual(Array.from(await other.scoreObjects(queries.s, queries.r)));
    expect((await readdir(dir)).filter((name) => name.includes('.tmp-'))).toEqual([]);
    // A save that fails midway (the model is gone) keeps the model that was there.
    other.dispose();
    await expect(other.save(target)).rejects.toThrow();
    const still = await loadModel(target, graph);
    expect(Array.from(await still.scoreObjects(queries.s, queries.r))).toEqual(Array.from(await loaded.scoreObjects(queries.s, queries.r)));
    expect((await readdir(dir)).filter((name) => name.includes('.tmp-'))).toEqual([]);
    loaded.dispose();
    still.dispose();
  });

  it('refuses to overwrite a directory that is not a model', async () => {
    const target = path.join(dir, 'foreign');
    await rm(target, { recursive: true, force: true });
    await (await import('node:fs/promises')).mkdir(target);
    await writeFile(path.join(target, 'notes.txt'), 'keep me');
    await expect(model.save(target)).rejects.toMatchObject({ code: 'E_USAGE' });
    expect(await readdir(target)).toEqual(['notes.txt']);
  });

  it('refuses a graph with predicates the model does not know, naming them', async () => {
    const target = path.join(dir, 'model');
    const g = graphFromKeys([...triplesOf(graph), ['http://example.org/e1', 'http://example.org/unknownPredicate', 'http://example.org/e2']]);
    await expect(loadModel(target, g)).rejects.toMatchObject({ code: 'E_MODEL', message: expect.stringContaining('unknownPredicate') });
  });

  it('refuses a graph whose dictionary has changed beyond recognition', async () => {
    const target = path.join(dir, 'model');
    const g = graphFromKeys(triplesOf(graph).map(([s, p, o]) => [s.replace('example.org', 'elsewhere.test'), p, o.replace('example.org', 'elsewhere.test')]));
    await expect(loadModel(target, g)).rejects.toMatchObject({ code: 'E_MODEL', message: expect.stringMatching(/dictionary differs.*0 of its/) });
  });

  it('handles entities new to the model: counted, flagged, and built from their neighbours', async () => {
    const target = path.join(dir, 'model');
    const g = graphFromKeys([
      ...triplesOf(graph),
      ['http://example.org/new1', 'http://example.org/p0', 'http://example.org/e1'],
      ['http://example.org/new2', 'http://example.org/p1', 'http://example.org/e2'],
      ['http://example.org/new2', 'http://example.org/p2', 'http://example.org/e7'],
    ]);
    const loaded = await loadModel(target, g);
    expect(loaded.unseenEntities).toBe(2);
    const n1 = loaded.entities.ofTerm[g.terms.id('http://example.org/new1')]!;
    const n2 = loaded.entities.ofTerm[g.terms.id('http://example.org/new2')]!;
    expect(loaded.unseen![n1]).toBe(1);
    expect(loaded.unseen![0]).toBe(0);
    const a = await loaded.scoreObjects(Int32Array.of(n1), Int32Array.of(0));
    const b = await loaded.scoreObjects(Int32Array.of(n2), Int32Array.of(0));
    expect(a.every(Number.isFinite)).toBe(true);
    // Same starting row (the mean), different neighbours: the R-GCN encoder tells them apart.
    expect(Array.from(a)).not.toEqual(Array.from(b));
    loaded.dispose();
  });

  it('refuses a damaged or missing model with a hint', async () => {
    await expect(loadModel(path.join(dir, 'nothing-here'), graph)).rejects.toMatchObject({ code: 'E_INPUT', hint: expect.stringContaining('plumb fit') });
    const target = path.join(dir, 'damaged');
    await model.save(target);
    await writeFile(path.join(target, 'weights.bin'), Buffer.alloc(12));
    await expect(loadModel(target, graph)).rejects.toMatchObject({ code: 'E_INPUT', message: expect.stringContaining('damaged') });
  });
});

import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../helpers/cli.js';
import { datasetsDir } from './datasets.js';

const nations = (split: string): string => path.join(datasetsDir, 'nations', `${split}.txt`);
let dir: string;

beforeAll(async () => {
  dir = await mkdtemp(path.join(tmpdir(), 'plumb-cli-model-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('plumb fit and plumb evaluate', () => {
  it('fits, saves, and evaluates link prediction with --json', async () => {
    const model = path.join(dir, 'nations');
    const fitted = await runCli(['fit', nations('train'), '--valid', nations('valid'), '--save', model, '--epochs', '3', '--dim', '16', '--backend', 'wasm', '--json']);
    expect(fitted.stderr).toContain('model backend wasm');
    expect(fitted.exitCode).toBe(0);
    const summary = JSON.parse(fitted.stdout) as Record<string, unknown>;
    expect(summary).toMatchObject({ backend: 'wasm', entities: 14, relations: 55, epochs: 3, saved: model });

    const evaluated = await runCli(['evaluate', '--model', model, '--test', nations('test'), '--known', nations('train'), nations('valid'), '--json']);
    expect(evaluated.exitCode).toBe(0);
    const metrics = JSON.parse(evaluated.stdout) as Record<string, number>;
    expect(Object.keys(metrics)).toEqual(expect.arrayContaining(['mrr', 'hits1', 'hits3', 'hits10', 'queries']));
    // Nations' test split: 201 triples, two queries each; 14 entities, so Hits@10 is easy.
    expect(metrics.queries).toBe(402);
    expect(metrics.mrr).toBeGreaterThan(0.2);
    expect(metrics.hits1).toBeLessThanOrEqual(metrics.hits3!);
    expect(metrics.hits3).toBeLessThanOrEqual(metrics.hits10!);

    const text = await runCli(['evaluate', '--model', model, '--test', nations('test'), '--known', nations('train'), nations('valid')]);
    expect(text.stdout).toMatch(/^filtered MRR \d\.\d{4} {3}Hits@1 \d\.\d{4} {3}Hits@3 \d\.\d{4} {3}Hits@10 \d\.\d{4}\n402 queries/);

    // Without --known the saved embeddings rank the test triples, filtered by the test triples alone.
    const alone = await runCli(['evaluate', '--model', model, '--test', nations('test')]);
    expect(alone.exitCode).toBe(0);
    expect(alone.stderr).toContain('filtered by the test triples only');
    expect(alone.stdout).toMatch(/402 queries .*; filtered by the test triples only/);
  });

  it('refuses bad usage with exit code 2 and a message', async () => {
    const none = await runCli(['evaluate', '--test', nations('test')]);
    expect(none.exitCode).toBe(2);
    expect(none.stderr).toMatch(/needs --model/);

    const badDim = await runCli(['fit', nations('train'), '--save', path.join(dir, 'x'), '--dim', 'wide']);
    expect(badDim.exitCode).toBe(2);
    expect(badDim.stderr).toMatch(/--dim must be a whole number/);

    const blocks = await runCli(['fit', nations('train'), '--save', path.join(dir, 'x'), '--decomposition', 'block', '--blocks', '3', '--dim', '16']);
    expect(blocks.exitCode).toBe(2);
    expect(blocks.stderr).toMatch(/not a multiple of 3/);

    const foreign = path.join(dir, 'foreign');
    await (await import('node:fs/promises')).mkdir(foreign);
    await writeFile(path.join(foreign, 'keep.txt'), 'x');
    const refused = await runCli(['fit', nations('train'), '--save', foreign, '--epochs', '1', '--dim', '8', '--backend', 'wasm']);
    expect(refused.exitCode).toBe(2);
    expect(refused.stderr).toMatch(/not a saved plumb model/);

    const missing = await runCli(['evaluate', '--model', path.join(dir, 'nope'), '--test', nations('test')]);
    expect(missing.exitCode).toBe(2);
    expect(missing.stderr).toMatch(/not a saved plumb model/);
  });
});

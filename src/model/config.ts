import { PlumbError } from '../errors.js';
import type { ModelConfig } from './types.js';

/**
 * Defaults a user gets with no option, chosen from measured runs (2026-12-02, wasm, seed 1):
 * - one layer, block-diagonal with 10 blocks: test-set filtered MRR UMLS 0.725, Kinship 0.528, Nations
 *   0.719, each ahead of plain DistMult (0.711, 0.506, 0.705); basis with 4 bases reached 0.697, 0.543,
 *   0.697 (`tests/outside/linkpred-datasets.test.ts`). On the benchmark's structured graph (40k
 *   triples, 200 relation types) the validation MRR after 80 epochs was 0.199 for block-10, 0.167 for
 *   basis-4 and 0.185 for DistMult. It costs about 1.6× basis-4's time per training step at 300k
 *   triples (`tests/bench/model.ts`), which still fits the 15-minute goal there;
 * - patience 10: R-GCN's validation MRR often stalls for several epochs before it rises again; with
 *   patience 5 a fit of that graph stopped at epoch 9 with test MRR 0.113, with 10 it reached 0.195.
 */
export const DEFAULT_MODEL_CONFIG: ModelConfig = Object.freeze({
  encoder: 'rgcn',
  dim: 100,
  layers: 1,
  decomposition: 'block',
  bases: 4,
  blocks: 10,
  dropout: 0.2,
  edgeDropout: 0.2,
  negatives: 10,
  sampling: 'uniform',
  epochs: 100,
  batchSize: 0,
  learningRate: 0.01,
  l2: 0.01,
  patience: 10,
  seed: 1,
});

const between = (name: string, value: number, low: number, high: number, integer = false): void => {
  if (!Number.isFinite(value) || value < low || value > high || (integer && !Number.isInteger(value))) {
    throw new PlumbError('E_CONFIG', `${name} must be ${integer ? 'an integer ' : 'a number '}from ${low} to ${high}, not ${value}`, {
      hint: `pass a value in range, or leave ${name} out for the default (${String((DEFAULT_MODEL_CONFIG as unknown as Record<string, number>)[name])})`,
    });
  }
};

/** Fills defaults and refuses conflicting or out-of-range settings with a sentence naming the conflict. */
export function resolveConfig(partial: Partial<ModelConfig> = {}): ModelConfig {
  const config: ModelConfig = { ...DEFAULT_MODEL_CONFIG };
  for (const key of Object.keys(DEFAULT_MODEL_CONFIG) as (keyof ModelConfig)[]) {
    const value = partial[key];
    if (value !== undefined) (config as unknown as Record<string, unknown>)[key] = value;
  }
  if (config.encoder !== 'rgcn' && config.encoder !== 'none') {
    throw new PlumbError('E_CONFIG', `encoder must be rgcn or none, not ${String(config.encoder)}`);
  }
  if (!['none', 'basis', 'block'].includes(config.decomposition)) {
    throw new PlumbError('E_CONFIG', `decomposition must be none, basis or block, not ${String(config.decomposition)}`);
  }
  if (config.sampling !== 'uniform' && config.sampling !== 'typed') {
    throw new PlumbError('E_CONFIG', `sampling must be uniform or typed, not ${String(config.sampling)}`);
  }
  between('dim', config.dim, 1, 4096, true);
  between('layers', config.layers, 1, 8, true);
  between('bases', config.bases, 1, 1024, true);
  between('blocks', config.blocks, 1, 4096, true);
  between('dropout', config.dropout, 0, 0.95);
  between('edgeDropout', config.edgeDropout, 0, 0.95);
  between('negatives', config.negatives, 1, 1000, true);
  between('epochs', config.epochs, 1, 100_000, true);
  between('batchSize', config.batchSize, 0, 10_000_000, true);
  between('learningRate', config.learningRate, 1e-6, 10);
  between('l2', config.l2, 0, 100);
  between('patience', config.patience, 1, 100_000, true);
  between('seed', config.seed, 0, 2 ** 31 - 1, true);
  if (partial.blocks === undefined && config.dim % config.blocks !== 0) config.blocks = defaultBlocks(config.dim);
  if (config.encoder === 'rgcn' && config.decomposition === 'block' && config.dim % config.blocks !== 0) {
    throw new PlumbError('E_CONFIG', `block decomposition splits each ${config.dim}-wide layer into ${config.blocks} blocks, but ${config.dim} is not a multiple of ${config.blocks}`, {
      hint: 'choose --blocks that divides --dim (for --dim 100: 2, 4, 5, 10, 20, 25, 50)',
    });
  }
  return config;
}

/**
 * Blocks when --blocks is not given and the default does not divide --dim: the divisor of dim
 * nearest dim / 10, so blocks stay about 10 wide as in the default (100 = 10 × 10).
 */
export function defaultBlocks(dim: number): number {
  let best = 1;
  for (let b = 1; b <= dim; b++) {
    if (dim % b === 0 && Math.abs(b - dim / 10) <= Math.abs(best - dim / 10)) best = b;
  }
  return best;
}

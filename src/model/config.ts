import { PlumbError } from '../errors.js';
import type { ModelConfig } from './types.js';

/**
 * Defaults a user gets with no option. Chosen from the runs recorded in `tests/bench/model.ts` and
 * `tests/outside/linkpred-datasets.test.ts` (figures in its doc comment): one basis-decomposed layer is the
 * fastest R-GCN on the WebAssembly backend and matched or beat two layers on the open datasets.
 */
export const DEFAULT_MODEL_CONFIG: ModelConfig = Object.freeze({
  encoder: 'rgcn',
  dim: 100,
  layers: 1,
  decomposition: 'basis',
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
  patience: 5,
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
  if (config.encoder === 'rgcn' && config.decomposition === 'block' && config.dim % config.blocks !== 0) {
    throw new PlumbError('E_CONFIG', `block decomposition splits each ${config.dim}-wide layer into ${config.blocks} blocks, but ${config.dim} is not a multiple of ${config.blocks}`, {
      hint: 'choose --blocks that divides --dim (for --dim 100: 2, 4, 5, 10, 20, 25, 50)',
    });
  }
  return config;
}

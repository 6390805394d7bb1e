import { describe, expect, it } from 'vitest';
import { defaultBlocks, resolveConfig } from '../../src/model/config.js';

describe('model defaults', () => {
  it('are one block-diagonal layer of 10 blocks at width 100', () => {
    expect(resolveConfig()).toMatchObject({ encoder: 'rgcn', layers: 1, dim: 100, decomposition: 'block', blocks: 10 });
  });

  it('keep blocks about 10 wide when --dim is not a multiple of 10 and --blocks is not given', () => {
    expect(resolveConfig({ dim: 16 }).blocks).toBe(2);
    expect(resolveConfig({ dim: 64 }).blocks).toBe(8);
    expect(resolveConfig({ dim: 7 }).blocks).toBe(1);
    expect(resolveConfig({ dim: 200 }).blocks).toBe(10);
    for (let dim = 1; dim <= 300; dim++) expect(dim % defaultBlocks(dim)).toBe(0);
  });

  it('refuses a --blocks the user gave that does not divide --dim', () => {
    expect(() => resolveConfig({ dim: 16, blocks: 10 })).toThrow(/16 is not a multiple of 10/);
  });
});

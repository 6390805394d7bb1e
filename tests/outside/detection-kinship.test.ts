import { describe, expect, it } from 'vitest';
import { detectionRun, readDataset } from './detection-shared.js';

/**
 * Detection on Kinship (Kemp et al. 2006; the train split as distributed since Dettmers et al. 2018),
 * protocol of DETECTION-NOTES.md: 5% `random` and 5% `range` errors added, each kind measured against
 * the true triples alone. R-GCN scores every triple out-of-fold (3 folds). Floors from measured runs,
 * with a margin. The reference study's in-sample figures: R-GCN 0.78 (random) and 0.74 (range), degree
 * heuristic 0.05 / 0.04 (Kinship's degrees are nearly uniform, so the heuristic is no better than chance).
 */
describe('detection on Kinship', () => {
  it('R-GCN out-of-fold beats the degree heuristic and random order on random errors, and random order on range errors', async () => {
    const graph = await readDataset('kinship');
    const run = await detectionRun(graph, ['random', 'range'], ['random', 'degree', 'rgcn'], { folds: 3, seed: 1 });
    console.log(`Kinship, 5% random + 5% range errors added\n${run.text}`);
    const rgcn = run.kindAp('rgcn');
    const degree = run.kindAp('degree');
    const random = run.kindAp('random');
    // Measured (seed 1, 3 folds, wasm, block-diagonal R-GCN): R-GCN 0.776 random / 0.716 range (4 bases:
    // 0.771 / 0.722); degree 0.041 / 0.041;
    // random order 0.048 / 0.048.
    expect(random.random).toBeLessThan(0.1);
    expect(rgcn.random).toBeGreaterThan(0.6);
    expect(rgcn.random).toBeGreaterThan(degree.random! + 0.5);
    expect(rgcn.random).toBeGreaterThan(random.random! + 0.5);
    expect(rgcn.range).toBeGreaterThan(random.range! + 0.45);
  }, 600_000);
});

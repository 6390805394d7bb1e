import { afterEach, describe, expect, it, vi } from 'vitest';
import { PlumbError } from '../../src/errors.js';
import { currentBackend, initBackend, isMemoryError, rethrowMemory, tf } from '../../src/model/backend.js';
import { Random } from '../../src/model/random.js';

/** Runs `f` on each backend and returns the values it produced there. */
async function onBoth(f: () => tf.Tensor | tf.Tensor[]): Promise<Record<'cpu' | 'wasm', Float32Array[]>> {
  const out = {} as Record<'cpu' | 'wasm', Float32Array[]>;
  for (const backend of ['cpu', 'wasm'] as const) {
    await initBackend(backend);
    const result = tf.tidy(f);
    const list = Array.isArray(result) ? result : [result];
    out[backend] = await Promise.all(list.map(async (t) => (await t.data()) as Float32Array));
    tf.dispose(list);
  }
  return out;
}

function expectClose(a: Float32Array[], b: Float32Array[], tolerance = 1e-5): void {
  expect(a.length).toBe(b.length);
  a.forEach((values, i) => {
    expect(values.length).toBe(b[i]!.length);
    for (let k = 0; k < values.length; k++) expect(Math.abs(values[k]! - b[i]![k]!)).toBeLessThan(tolerance);
  });
}

describe('backend choice', () => {
  afterEach(() => vi.restoreAllMocks());

  // First in the file: the advert is printed on the cpu backend's first use in a process.
  it('prints no advert on stdout or stderr when the cpu backend starts', async () => {
    const writes: string[] = [];
    vi.spyOn(process.stdout, 'write').mockImplementation((chunk: string | Uint8Array) => {
      writes.push(String(chunk));
      return true;
    });
    vi.spyOn(console, 'warn').mockImplementation((...args: unknown[]) => void writes.push(args.join(' ')));
    vi.spyOn(console, 'log').mockImplementation((...args: unknown[]) => void writes.push(args.join(' ')));
    await initBackend('cpu');
    const t = tf.tensor1d([1, 2, 3]);
    await t.data();
    t.dispose();
    expect(writes.join('')).not.toMatch(/tfjs-node|node backend/i);
  });

  it('starts the backend asked for and reports it', async () => {
    expect(await initBackend('cpu')).toBe('cpu');
    expect(currentBackend()).toBe('cpu');
    expect(await initBackend('wasm')).toBe('wasm');
    expect(tf.getBackend()).toBe('wasm');
  });

  it('auto keeps WebAssembly for a tiny graph once it runs, and leaves cpu for a larger one', async () => {
    await initBackend('wasm');
    expect(await initBackend('auto', 10)).toBe('wasm');
    await initBackend('cpu');
    expect(await initBackend('auto', 10)).toBe('cpu');
    expect(await initBackend('auto', 50_000)).toBe('wasm');
  });

  it('refuses the native backend with a hint when @tensorflow/tfjs-node is not installed', async () => {
    let available = true;
    try {
      await import(/* @vite-ignore */ ['@tensorflow', 'tfjs-node'].join('/'));
    } catch {
      available = false;
    }
    if (available) {
      expect(await initBackend('tensorflow')).toBe('tensorflow');
      return;
    }
    await expect(initBackend('tensorflow')).rejects.toMatchObject({ code: 'E_CONFIG', hint: expect.stringContaining('--backend wasm') });
  });

});

describe('kernels registered on the WebAssembly backend agree with the cpu backend', () => {
  const random = new Random(7);
  const data2 = random.uniform(40 * 5, 1);
  const data3 = random.uniform(40 * 3 * 4, 1);
  const ids = Int32Array.from({ length: 40 }, () => random.int(9));

  it('UnsortedSegmentSum (built on ScatterNd) sums rows of 2-D and 3-D inputs, duplicates included', async () => {
    const got = await onBoth(() => [
      tf.unsortedSegmentSum(tf.tensor2d(data2, [40, 5]), tf.tensor1d(ids, 'int32'), 9),
      tf.unsortedSegmentSum(tf.tensor3d(data3, [40, 3, 4]), tf.tensor1d(ids, 'int32'), 12),
    ]);
    expectClose(got.wasm, got.cpu);
    // And against a plain sum, so agreement is not agreement in error.
    const expected = new Float32Array(9 * 5);
    ids.forEach((id, row) => {
      for (let k = 0; k < 5; k++) expected[id * 5 + k]! += data2[row * 5 + k]!;
    });
    expectClose([got.wasm[0]!], [expected]);
  });

  it('the gradient of tf.gather (which needs UnsortedSegmentSum)', async () => {
    const weights = random.uniform(40, 1);
    const got = await onBoth(() => {
      const params = tf.tensor2d(data2, [40, 5]).slice([0, 0], [12, 5]);
      const index = tf.tensor1d(Int32Array.from(ids, (i) => i % 12), 'int32');
      const w = tf.tensor2d(weights, [40, 1]);
      return tf.grad((p: tf.Tensor) => tf.sum(tf.mul(tf.gather(p, index), w)))(params);
    });
    expectClose(got.wasm, got.cpu);
  });

  it('the gradient of tf.gatherND (none in tfjs-core 4.22; registered as scatterND)', async () => {
    const weights = random.uniform(40 * 5, 1);
    const got = await onBoth(() => {
      const params = tf.tensor2d(data2, [40, 5]).slice([0, 0], [9, 5]);
      const index = tf.tensor2d(ids, [40, 1], 'int32');
      const w = tf.tensor2d(weights, [40, 5]);
      return tf.grad((p: tf.Tensor) => tf.sum(tf.mul(tf.gatherND(p, index), w)))(params);
    });
    expectClose(got.wasm, got.cpu);
    const expected = new Float32Array(9 * 5);
    ids.forEach((id, row) => {
      for (let k = 0; k < 5; k++) expected[id * 5 + k]! += weights[row * 5 + k]!;
    });
    expectClose([got.cpu[0]!], [expected]);
  });
});

describe('running out of WebAssembly memory', () => {
  it('recognises the ways a full heap shows itself', () => {
    expect(isMemoryError(new Error('RuntimeError: memory access out of bounds'))).toBe(true);
    expect(isMemoryError(new Error('Aborted(). Build with -sASSERTIONS for more info.'))).toBe(true);
    expect(isMemoryError(new Error('shape mismatch'))).toBe(false);
  });

  it('becomes an E_MEMORY PlumbError that says what to change', () => {
    let caught: unknown;
    try {
      rethrowMemory(new Error('memory access out of bounds'), 'training');
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(PlumbError);
    expect(caught).toMatchObject({ code: 'E_MEMORY', exitCode: 3 });
    expect((caught as PlumbError).hint).toMatch(/--dim/);
    const other = new Error('something else');
    expect(() => rethrowMemory(other, 'training')).toThrow(other);
  });
});

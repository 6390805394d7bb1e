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
    for (let k = 0; k < values.length; k++) expect(Math.abs(values[k]! - b[i]![k]!)).toBeLessThanOrEqual(tolerance);
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
    expect(await initBackend('auto', 5)).toBe('wasm');
    await initBackend('cpu');
    expect(await initBackend('auto', 5)).toBe('cpu');
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

describe('Slice, SplitV and Unpack on the WebAssembly backend (replaced: they copied their whole input per call)', () => {
  const random = new Random(3);
  const x4 = random.uniform(3 * 4 * 5 * 6, 1);
  const ints = Int32Array.from({ length: 7 * 9 }, (_, i) => i * 3 - 50);

  it('equal the cpu backend on contiguous and strided slices of rank 1 to 5', async () => {
    const got = await onBoth(() => {
      const t = tf.tensor4d(x4, [3, 4, 5, 6]);
      return [
        tf.slice(tf.tensor1d(x4), [7], [20]),
        tf.slice(t.reshape([12, 30]), [2, 0], [5, 30]),
        tf.slice(t.reshape([12, 30]), [1, 3], [6, 11]),
        tf.slice(t.reshape([3, 20, 6]), [1, 2, 1], [2, 15, 4]),
        tf.slice(t, [1, 1, 0, 2], [2, 3, 5, 3]),
        tf.slice(t.reshape([3, 2, 2, 5, 6]), [0, 1, 0, 1, 1], [3, 1, 2, 3, 4]),
        tf.slice(t.reshape([12, 30]), [4, 4], [0, 3]),
        ...tf.split(t.reshape([12, 30]), [5, 0, 7], 0),
        ...tf.split(t.reshape([12, 30]), [10, 20], 1),
        ...tf.unstack(t, 0),
        ...tf.unstack(t, 2),
        tf.cast(tf.slice(tf.tensor2d(ints, [7, 9], 'int32'), [2, 3], [4, 5]), 'float32'),
      ];
    });
    expectClose(got.wasm, got.cpu, 0);
  });

  it('slice an [86k, 100] tensor 500 times in well under a second per hundred slices', async () => {
    await initBackend('wasm');
    const m = tf.zeros([86_400, 100]);
    const started = performance.now();
    const parts = Array.from({ length: 500 }, (_, r) => tf.slice(m, [r * 170, 0], [170, -1]));
    await parts[499]!.data();
    // The backend's own kernel took about 65 s here (a full copy of m per call).
    expect(performance.now() - started).toBeLessThan(20_000);
    tf.dispose([m, ...parts]);
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

import { createRequire } from 'node:module';
import path from 'node:path';
import * as tf from '@tensorflow/tfjs';
import { setWasmPaths } from '@tensorflow/tfjs-backend-wasm';
import { PlumbError } from '../errors.js';
import type { BackendName } from './types.js';

/**
 * Picks and starts the TensorFlow.js backend, once per process.
 *
 * `auto` takes the native backend (`@tensorflow/tfjs-node`) where it resolves, else WebAssembly; the
 * pure-JS cpu backend (about 60× slower per training step) only for toy graphs of under
 * {@link TINY_GRAPH} entities, or when asked for. `tfjs-node` is imported dynamically behind a
 * guard: offline it cannot be installed, and its absence must never fail.
 */
export const TINY_GRAPH = 10;

const require = createRequire(import.meta.url);
let current: BackendName | undefined;
let wasmReady = false;
let nodeBackend: boolean | undefined;

async function hasNodeBackend(): Promise<boolean> {
  if (nodeBackend !== undefined) return nodeBackend;
  try {
    // A variable specifier keeps bundlers and the type checker from resolving an optional package.
    const name = '@tensorflow/tfjs-node';
    await import(/* @vite-ignore */ name);
    nodeBackend = tf.findBackend('tensorflow') !== null || tf.findBackendFactory('tensorflow') !== null;
  } catch {
    nodeBackend = false;
  }
  return nodeBackend;
}

async function start(name: BackendName): Promise<void> {
  if (name === 'wasm' && !wasmReady) {
    // A file-system directory: in Node the module reads the .wasm with fs, no fetch.
    const dist = path.dirname(require.resolve('@tensorflow/tfjs-backend-wasm'));
    setWasmPaths(`${dist}${path.sep}`);
    wasmReady = true;
  }
  // The cpu backend otherwise prints an advert for the native backend on first use.
  tf.enableProdMode();
  const ok = await tf.setBackend(name);
  if (!ok) {
    throw new PlumbError('E_CONFIG', `the TensorFlow.js ${name} backend failed to start`, {
      hint: name === 'wasm' ? 'pass --backend cpu to run without WebAssembly (much slower)' : 'pass --backend wasm',
    });
  }
  await tf.ready();
  registerMissingKernels();
  current = name;
}

/**
 * Starts the best backend for a graph of about `numEntitiesHint` entities, or the one asked for, and
 * returns its name. Idempotent: a later call keeps the running backend unless it must change (an
 * explicit other choice, or `auto` outgrowing the cpu backend).
 */
export async function initBackend(preferred: BackendName | 'auto' = 'auto', numEntitiesHint?: number): Promise<BackendName> {
  if (preferred === 'tensorflow') {
    if (!(await hasNodeBackend())) {
      throw new PlumbError('E_CONFIG', 'the native TensorFlow backend (@tensorflow/tfjs-node) is not installed', {
        hint: 'install @tensorflow/tfjs-node where it can download libtensorflow, or pass --backend wasm',
      });
    }
  }
  if (preferred !== 'auto') {
    if (current !== preferred) await start(preferred);
    return preferred;
  }
  if (await hasNodeBackend()) {
    if (current !== 'tensorflow') await start('tensorflow');
    return 'tensorflow';
  }
  const tiny = numEntitiesHint !== undefined && numEntitiesHint < TINY_GRAPH;
  if (current === undefined) await start(tiny ? 'cpu' : 'wasm');
  else if (current === 'cpu' && !tiny) await start('wasm');
  return current!;
}

/** The running backend, or undefined before {@link initBackend}. */
export function currentBackend(): BackendName | undefined {
  return current;
}

let registered = false;

type WasmBackendLike = {
  makeOutput(shape: number[], dtype: tf.DataType): tf.TensorInfo;
  typedArrayFromHeap(t: tf.TensorInfo): Float32Array | Int32Array | Uint8Array;
};

/**
 * Copies x[begin : begin + size] into a new tensor through views of the WebAssembly heap. The
 * backend's own Slice reads the whole input out of the heap first (a full copy per call), which
 * makes a loop of slices over a large tensor quadratic; this copies only what it returns.
 */
function sliceFromHeap(backend: WasmBackendLike, x: tf.TensorInfo, begin: number[], size: number[]): tf.TensorInfo {
  const [b, s] = tf.slice_util.parseSliceParams(x as tf.Tensor, begin, size) as [number[], number[]];
  // Allocate first: growing the heap detaches every view taken before.
  const out = backend.makeOutput(s, x.dtype);
  const total = tf.util.sizeFromShape(s);
  if (total === 0) return out;
  const from = backend.typedArrayFromHeap(x);
  const into = backend.typedArrayFromHeap(out);
  const rank = x.shape.length;
  const strides = tf.util.computeStrides(x.shape);
  if (tf.slice_util.isSliceContinous(x.shape, b, s)) {
    const offset = tf.slice_util.computeFlatOffset(b, strides);
    into.set(from.subarray(offset, offset + total));
    return out;
  }
  const run = s[rank - 1]!;
  const index = new Array<number>(Math.max(0, rank - 1)).fill(0);
  for (let at = 0; at < total; at += run) {
    let offset = b[rank - 1]!;
    for (let d = 0; d < rank - 1; d++) offset += (b[d]! + index[d]!) * strides[d]!;
    into.set(from.subarray(offset, offset + run), at);
    for (let d = rank - 2; d >= 0; d--) {
      if (++index[d]! < s[d]!) break;
      index[d] = 0;
    }
  }
  return out;
}

/** Replaces a wasm kernel, keeping the original for inputs the replacement does not handle (strings). */
function replaceWasmKernel(name: string, kernelFunc: (args: { inputs: tf.NamedTensorInfoMap; backend: unknown; attrs: tf.NamedAttrMap }, original: tf.KernelFunc) => tf.TensorInfo | tf.TensorInfo[]): void {
  const original = tf.getKernel(name, 'wasm');
  if (original === undefined) return;
  tf.unregisterKernel(name, 'wasm');
  tf.registerKernel({ kernelName: name, backendName: 'wasm', kernelFunc: (args) => kernelFunc(args as never, original.kernelFunc) });
}

/**
 * What the WebAssembly backend lacks for training, built from kernels it has:
 * - `UnsortedSegmentSum` (needed by the gradient of `tf.gather`) on `ScatterNd`, which sums
 *   duplicate indices. ScatterNd does not check bounds: segment ids must lie in [0, numSegments).
 * - the gradient of `GatherNd` (none in tfjs-core 4.22): `scatterND` of the upstream gradient.
 * - `Slice`, `SplitV` and `Unpack` that copy only what they return (see {@link sliceFromHeap}):
 *   500 slices of 170 rows from an [86k, 100] tensor took 65 s with the backend's own kernel.
 */
export function registerMissingKernels(): void {
  if (registered) return;
  registered = true;
  if (tf.getKernel('UnsortedSegmentSum', 'wasm') === undefined && tf.findBackendFactory('wasm') !== null) {
    tf.registerKernel({
      kernelName: 'UnsortedSegmentSum',
      backendName: 'wasm',
      kernelFunc: ({ inputs, backend, attrs }) => {
        const { x, segmentIds } = inputs as { x: tf.TensorInfo; segmentIds: tf.TensorInfo };
        const numSegments = (attrs as { numSegments: number }).numSegments;
        const shape = [numSegments, ...x.shape.slice(segmentIds.shape.length)];
        const run = (name: string, ins: tf.NamedTensorInfoMap, at: tf.NamedAttrMap): tf.TensorInfo =>
          tf.getKernel(name, 'wasm')!.kernelFunc({ inputs: ins, backend, attrs: at }) as tf.TensorInfo;
        const rows = segmentIds.shape.reduce((a, b) => a * b, 1);
        if (rows === 0) return run('Fill', {}, { shape, value: 0, dtype: x.dtype });
        const indices = run('Reshape', { x: segmentIds }, { shape: [rows, 1] });
        const updates = run('Reshape', { x }, { shape: [rows, ...x.shape.slice(segmentIds.shape.length)] });
        const out = run('ScatterNd', { indices, updates }, { shape });
        const b = backend as { disposeData(id: tf.DataId): boolean };
        b.disposeData(indices.dataId);
        b.disposeData(updates.dataId);
        return out;
      },
    });
  }
  if (tf.findBackendFactory('wasm') !== null) {
    replaceWasmKernel('Slice', (args, original) => {
      const { x } = args.inputs as { x: tf.TensorInfo };
      if (x.dtype === 'string') return original(args as never);
      const { begin, size } = args.attrs as { begin: number[]; size: number[] };
      return sliceFromHeap(args.backend as WasmBackendLike, x, begin, size);
    });
    replaceWasmKernel('SplitV', (args, original) => {
      const { x } = args.inputs as { x: tf.TensorInfo };
      if (x.dtype === 'string') return original(args as never);
      const { numOrSizeSplits, axis } = args.attrs as { numOrSizeSplits: number | number[]; axis: number };
      const at = tf.util.parseAxisParam(axis, x.shape)[0]!;
      const sizes = tf.backend_util.prepareSplitSize(x as tf.Tensor, numOrSizeSplits, at);
      const begin = new Array<number>(x.shape.length).fill(0);
      return sizes.map((n) => {
        const size = [...x.shape];
        size[at] = n;
        const piece = sliceFromHeap(args.backend as WasmBackendLike, x, [...begin], size);
        begin[at]! += n;
        return piece;
      });
    });
    replaceWasmKernel('Unpack', (args, original) => {
      const { value } = args.inputs as { value: tf.TensorInfo };
      if (value.dtype === 'string') return original(args as never);
      let axis = (args.attrs as { axis: number }).axis;
      if (axis < 0) axis += value.shape.length;
      const outShape = value.shape.filter((_, d) => d !== axis);
      const size = [...value.shape];
      size[axis] = 1;
      return Array.from({ length: value.shape[axis]! }, (_, i) => {
        const begin = new Array<number>(value.shape.length).fill(0);
        begin[axis] = i;
        const piece = sliceFromHeap(args.backend as WasmBackendLike, value, begin, size);
        return { dataId: piece.dataId, dtype: piece.dtype, shape: outShape };
      });
    });
  }
  if (tf.getGradient('GatherNd') === undefined) {
    tf.registerGradient({
      kernelName: 'GatherNd',
      inputsToSave: ['params', 'indices'],
      gradFunc: (dy, saved) => {
        const [params, indices] = saved as [tf.Tensor, tf.Tensor];
        return {
          params: () => tf.scatterND(indices, dy as tf.Tensor, params.shape),
          indices: () => tf.zerosLike(indices),
        };
      },
    });
  }
}

/** True for the ways a full WebAssembly heap (4 GB at most) shows itself. */
export function isMemoryError(error: unknown): boolean {
  const message = error instanceof Error ? error.message : String(error);
  return /memory access out of bounds|Aborted\(|Out of memory|Cannot enlarge memory|Array buffer allocation failed|Invalid typed array length/i.test(message);
}

/** Rethrows a heap exhaustion as a PlumbError saying what to change; anything else unchanged. */
export function rethrowMemory(error: unknown, what: string): never {
  if (isMemoryError(error)) {
    throw new PlumbError('E_MEMORY', `the model ran out of memory while ${what} (the WebAssembly heap holds 4 GB at most)`, {
      hint: 'use a smaller --dim, fewer --layers, a smaller --batch-size or more --edge-dropout; or install @tensorflow/tfjs-node',
      cause: error,
    });
  }
  throw error;
}

export { tf };

import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { parentPort, Worker, workerData } from 'node:worker_threads';
import { availableParallelism } from 'node:os';
import { PlumbError, type ErrorCode } from '../errors.js';
import { buildCsr, type Graph } from '../graph/store.js';
import { TermDictionary } from '../graph/terms.js';
import { indexGraph } from '../model/indexing.js';
import type { BackendName, FitOptions, HistoryEntry, ModelConfig, TrainedModel } from '../model/types.js';
import type { ProgressSink } from '../progress.js';

/**
 * Fold models on a second core. TensorFlow.js's WebAssembly backend runs on one thread in Node, so a
 * `worker_thread` with its own TensorFlow.js instance can fit and score another fold at the same time.
 * The worker keeps each model it fitted until told to drop it; the main thread talks to it through a
 * {@link RemoteModel}, so explanations run against the fold model that scored the triple wherever
 * it lives.
 */

/** The graph as plain arrays, cheap to post to a worker. */
export interface GraphData {
  keys: readonly string[];
  s: Int32Array;
  p: Int32Array;
  o: Int32Array;
  g: Int32Array;
  files: readonly string[];
  file: Uint16Array;
  line: Uint32Array;
}

export function graphData(graph: Graph): GraphData {
  return {
    keys: graph.terms.allKeys(),
    s: graph.s,
    p: graph.p,
    o: graph.o,
    g: graph.g,
    files: graph.provenance.files,
    file: graph.provenance.file,
    line: graph.provenance.line,
  };
}

export function graphFromData(data: GraphData): Graph {
  const terms = new TermDictionary();
  for (const k of data.keys) terms.intern(k);
  const n = terms.size;
  return {
    terms,
    size: data.s.length,
    s: data.s,
    p: data.p,
    o: data.o,
    g: data.g,
    provenance: { files: data.files, file: data.file, line: data.line },
    bySubject: buildCsr(data.s, n),
    byObject: buildCsr(data.o, n),
    byPredicate: buildCsr(data.p, n),
  };
}

/** Fit options that can cross a thread: no model, no functions. */
export type PlainFitOptions = Omit<FitOptions, 'warmStart' | 'progress'>;

type Request =
  | { id: number; kind: 'init'; graph: GraphData }
  | { id: number; kind: 'fit'; handle: number; options: PlainFitOptions; score: Int32Array; ranks: boolean }
  | { id: number; kind: 'score'; handle: number; s: Int32Array; r: Int32Array; o: Int32Array }
  | { id: number; kind: 'objects'; handle: number; s: Int32Array; r: Int32Array }
  | { id: number; kind: 'subjects'; handle: number; r: Int32Array; o: Int32Array }
  | { id: number; kind: 'dispose'; handle: number };

interface FitReply {
  config: ModelConfig;
  backend: BackendName;
  history: HistoryEntry[];
  logits: Float32Array;
  subjectRank?: Float64Array;
  objectRank?: Float64Array;
  /** Seconds spent scoring and ranking, after the fit. */
  scoreSeconds: number;
}

type Reply =
  | { id: number; ok: true; value: unknown }
  | { id: number; ok: false; error: { message: string; code?: ErrorCode; hint?: string } }
  | { id: -1; progress: { phase: string; done: number; total?: number; detail?: string } };

/** The worker's side: runs in the thread the pool starts. */
async function serve(): Promise<void> {
  const port = parentPort!;
  const { fit } = await import('../model/index.js');
  const { filteredRanks } = await import('./ranking.js');
  const { scoreTriples } = await import('./crossfit.js');
  let graph: Graph | undefined;
  const models = new Map<number, TrainedModel>();
  const model = (handle: number): TrainedModel => {
    const m = models.get(handle);
    if (!m) throw new Error(`fold worker: no model ${handle}`);
    return m;
  };
  port.on('message', (request: Request) => {
    void (async () => {
      try {
        let value: unknown;
        switch (request.kind) {
          case 'init':
            graph = graphFromData(request.graph);
            value = true;
            break;
          case 'fit': {
            if (!graph) throw new Error('fold worker: no graph');
            const m = await fit(graph, {
              ...request.options,
              progress: (e) => port.postMessage({ id: -1, progress: e } satisfies Reply),
            });
            models.set(request.handle, m);
            const scoring = performance.now();
            const reply: FitReply = { config: m.config, backend: m.backend, history: m.history, logits: await scoreTriples(m, graph, request.score), scoreSeconds: 0 };
            if (request.ranks) {
              const r = await filteredRanks(m, graph, request.score);
              reply.subjectRank = r.subjectRank;
              reply.objectRank = r.objectRank;
            }
            reply.scoreSeconds = (performance.now() - scoring) / 1000;
            value = reply;
            break;
          }
          case 'score':
            value = await model(request.handle).score(request.s, request.r, request.o);
            break;
          case 'objects':
            value = await model(request.handle).scoreObjects(request.s, request.r);
            break;
          case 'subjects':
            value = await model(request.handle).scoreSubjects(request.r, request.o);
            break;
          case 'dispose':
            models.get(request.handle)?.dispose();
            models.delete(request.handle);
            value = true;
            break;
        }
        port.postMessage({ id: request.id, ok: true, value } satisfies Reply);
      } catch (error) {
        const e = error as Error & { code?: ErrorCode; hint?: string };
        const payload: { message: string; code?: ErrorCode; hint?: string } = { message: e.message ?? String(error) };
        if (error instanceof PlumbError) {
          payload.code = error.code;
          if (error.hint !== undefined) payload.hint = error.hint;
        }
        port.postMessage({ id: request.id, ok: false, error: payload } satisfies Reply);
      }
    })();
  });
}

/** A worker thread holding one TensorFlow.js instance and the fold models it fitted. */
export class FoldWorker {
  private readonly worker: Worker;
  private next = 1;
  private readonly pending = new Map<number, { resolve: (v: unknown) => void; reject: (e: Error) => void }>();
  private handles = 0;
  progress: ProgressSink = () => {};

  private constructor(worker: Worker) {
    this.worker = worker;
    worker.on('message', (reply: Reply) => {
      if ('progress' in reply) {
        this.progress(reply.progress);
        return;
      }
      const waiting = this.pending.get(reply.id);
      if (!waiting) return;
      this.pending.delete(reply.id);
      if (reply.ok) waiting.resolve(reply.value);
      else {
        const { message, code, hint } = reply.error;
        waiting.reject(code ? new PlumbError(code, message, hint === undefined ? {} : { hint }) : new Error(message));
      }
    });
    worker.on('error', (error) => this.failAll(error));
    worker.on('exit', (code) => this.failAll(new Error(`the fold worker stopped (exit code ${code})`)));
  }

  private failAll(error: Error): void {
    for (const w of this.pending.values()) w.reject(error);
    this.pending.clear();
  }

  /** Starts a worker and sends it the graph. */
  static async start(graph: Graph): Promise<FoldWorker> {
    const url = new URL(import.meta.url);
    const data = { workerData: { [WORKER_MARK]: true } };
    let worker: Worker;
    if (url.pathname.endsWith('.ts')) {
      // From TypeScript sources (tests, tsx) the thread registers tsx's loader before loading this module.
      // `tsx/esm/api` as an ES module (its exports map sends `import` there; require.resolve would give the CommonJS build).
      const tsxDir = dirname(createRequire(import.meta.url).resolve('tsx/package.json'));
      const api = pathToFileURL(join(tsxDir, 'dist', 'esm', 'api', 'index.mjs')).href;
      const code = `import(${JSON.stringify(api)}).then((m) => { m.register(); return import(${JSON.stringify(url.href)}); });`;
      worker = new Worker(code, { eval: true, ...data });
    } else worker = new Worker(url, data);
    const fw = new FoldWorker(worker);
    await fw.call({ kind: 'init', graph: graphData(graph) });
    return fw;
  }

  call(request: DistributiveOmit<Request, 'id'>): Promise<unknown> {
    const id = this.next++;
    return new Promise((resolve, reject) => {
      this.pending.set(id, { resolve, reject });
      this.worker.postMessage({ ...request, id });
    });
  }

  /** Fits a fold model in the worker and scores `score` with it; the model stays there as a {@link RemoteModel}. */
  async fit(graph: Graph, options: PlainFitOptions, score: Int32Array, ranks: boolean): Promise<{ model: RemoteModel; reply: FitReply }> {
    const handle = ++this.handles;
    const reply = (await this.call({ kind: 'fit', handle, options, score, ranks })) as FitReply;
    return { model: new RemoteModel(this, handle, graph, reply), reply };
  }

  async stop(): Promise<void> {
    await this.worker.terminate();
  }
}

type DistributiveOmit<T, K extends PropertyKey> = T extends unknown ? Omit<T, K> : never;

/** A model that lives in a {@link FoldWorker}; its indexes are recomputed here from the same graph. */
export class RemoteModel implements TrainedModel {
  readonly config: ModelConfig;
  readonly backend: BackendName;
  readonly history: HistoryEntry[];
  readonly entities;
  readonly relations;
  private disposed = false;

  constructor(
    private readonly worker: FoldWorker,
    private readonly handle: number,
    graph: Graph,
    reply: FitReply,
  ) {
    this.config = reply.config;
    this.backend = reply.backend;
    this.history = reply.history;
    const { entities, relations } = indexGraph(graph);
    this.entities = entities;
    this.relations = relations;
  }

  async score(s: Int32Array, r: Int32Array, o: Int32Array): Promise<Float32Array> {
    return (await this.worker.call({ kind: 'score', handle: this.handle, s, r, o })) as Float32Array;
  }

  async scoreObjects(s: Int32Array, r: Int32Array): Promise<Float32Array> {
    return (await this.worker.call({ kind: 'objects', handle: this.handle, s, r })) as Float32Array;
  }

  async scoreSubjects(r: Int32Array, o: Int32Array): Promise<Float32Array> {
    return (await this.worker.call({ kind: 'subjects', handle: this.handle, r, o })) as Float32Array;
  }

  async save(): Promise<void> {
    throw new Error('a fold model in a worker cannot be saved; fit with `plumb fit --save`');
  }

  dispose(): void {
    if (this.disposed) return;
    this.disposed = true;
    void this.worker.call({ kind: 'dispose', handle: this.handle }).catch(() => {});
  }
}

/**
 * Worker threads worth starting for k folds: one per core, at most k, and none on a single core (the
 * main thread only waits while workers fit, so it needs no core of its own).
 */
export function defaultWorkers(folds: number, cores = availableParallelism()): number {
  return cores < 2 ? 0 : Math.min(folds, cores);
}

const WORKER_MARK = 'plumbFoldWorker';

// Only a thread started by FoldWorker.start serves; importing this module anywhere else does nothing.
if (parentPort && (workerData as Record<string, unknown> | null)?.[WORKER_MARK] === true) void serve();

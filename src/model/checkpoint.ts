import { randomBytes } from 'node:crypto';
import { promises as fs } from 'node:fs';
import path from 'node:path';
import type { Graph } from '../graph/store.js';
import { TermDictionary } from '../graph/terms.js';
import { PlumbError } from '../errors.js';
import { VERSION } from '../version.js';
import { initBackend, rethrowMemory, tf } from './backend.js';
import { resolveConfig } from './config.js';
import { EdgeLayout } from './edges.js';
import { embed, layerShapes, uniquePrefix, weightList, type Weights } from './encoder.js';
import { fingerprintStrings, indexGraph, modelTriples } from './indexing.js';
import { edgeFingerprint } from './train.js';
import { RelationalModel, type Fingerprint } from './trained.js';
import type { BackendName, EntityIndex, HistoryEntry, ModelConfig, RelationIndex, TrainedModel } from './types.js';

/**
 * A saved model is a directory:
 * - `model.json`: format, configuration, backend, training history, relation keys, the fingerprint
 *   of the dictionary and of the message-passing triples, and the layout of `weights.bin`;
 * - `entities.txt`: the entity term keys, one per line, in index order;
 * - `weights.bin`: float32 little-endian values of every tensor, then the final entity embeddings.
 * It is written into a temporary sibling directory and renamed into place, so a crash mid-write
 * never leaves a half model that loads.
 */
const FORMAT = 'plumb-model';
const FORMAT_VERSION = 1;
/** Refuse a graph of which fewer than this share of entities are known to the model. */
const MIN_SHARED_ENTITIES = 0.5;

interface TensorEntry {
  name: string;
  shape: number[];
  /** Offset in float32 values. */
  offset: number;
}

interface Manifest {
  format: string;
  formatVersion: number;
  plumb: string;
  config: ModelConfig;
  backend: BackendName;
  history: HistoryEntry[];
  entityCount: number;
  relations: string[];
  fingerprint: Fingerprint;
  tensors: TensorEntry[];
}

function namedTensors(model: RelationalModel): [string, tf.Tensor][] {
  const list: [string, tf.Tensor][] = [['entities', model.weights.entities]];
  model.weights.layers.forEach((layer, l) => {
    list.push([`layer${l}/w0`, layer.w0], [`layer${l}/w`, layer.w]);
    if (layer.a) list.push([`layer${l}/a`, layer.a]);
  });
  list.push(['relations', model.weights.relations], ['embeddings', model.embeddings]);
  return list;
}

export async function saveModel(model: RelationalModel, dir: string): Promise<void> {
  const target = path.resolve(dir);
  await refuseForeignDirectory(target);
  const parent = path.dirname(target);
  await fs.mkdir(parent, { recursive: true });
  const temp = path.join(parent, `.${path.basename(target)}.tmp-${process.pid}-${randomBytes(4).toString('hex')}`);
  await fs.mkdir(temp);
  try {
    const tensors: TensorEntry[] = [];
    const chunks: Buffer[] = [];
    let offset = 0;
    for (const [name, tensor] of namedTensors(model)) {
      const values = (await tensor.data()) as Float32Array;
      tensors.push({ name, shape: tensor.shape, offset });
      chunks.push(Buffer.from(values.buffer, values.byteOffset, values.byteLength));
      offset += values.length;
    }
    const manifest: Manifest = {
      format: FORMAT,
      formatVersion: FORMAT_VERSION,
      plumb: VERSION,
      config: model.config,
      backend: model.backend,
      history: model.history,
      entityCount: model.entities.count,
      relations: model.relations.keys,
      fingerprint: model.fingerprint,
      tensors,
    };
    await fs.writeFile(path.join(temp, 'weights.bin'), Buffer.concat(chunks));
    await fs.writeFile(path.join(temp, 'entities.txt'), model.entityKeys.join('\n'));
    // Written last: a directory without it is not a model.
    await fs.writeFile(path.join(temp, 'model.json'), `${JSON.stringify(manifest, null, 1)}\n`);
    await replaceDirectory(temp, target);
  } catch (error) {
    await fs.rm(temp, { recursive: true, force: true });
    if (error instanceof PlumbError) throw error;
    throw new PlumbError('E_INPUT', `could not save the model to ${dir}: ${(error as Error).message}`, { hint: 'check that the directory is writable', cause: error });
  }
}

async function refuseForeignDirectory(target: string): Promise<void> {
  let entries: string[];
  try {
    entries = await fs.readdir(target);
  } catch {
    return;
  }
  if (entries.length > 0 && !entries.includes('model.json')) {
    throw new PlumbError('E_USAGE', `${target} exists and is not a saved plumb model; refusing to replace it`, {
      hint: 'pass --save a new directory, or one that holds an earlier model',
    });
  }
}

async function replaceDirectory(temp: string, target: string): Promise<void> {
  try {
    await fs.rename(temp, target);
    return;
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    if (code !== 'ENOTEMPTY' && code !== 'EEXIST' && code !== 'EISDIR' && code !== 'ENOTDIR') throw error;
  }
  const old = `${temp}.old`;
  await fs.rename(target, old);
  await fs.rename(temp, target);
  await fs.rm(old, { recursive: true, force: true });
}

export interface LoadOptions {
  backend?: BackendName | 'auto';
  /** Triples of `graph` (1 = hidden) kept out of message passing, as in {@link fit}'s `exclude`. */
  exclude?: Uint8Array;
}

async function readManifest(dir: string): Promise<Manifest> {
  const file = path.join(dir, 'model.json');
  let text: string;
  try {
    text = await fs.readFile(file, 'utf8');
  } catch {
    throw new PlumbError('E_INPUT', `${dir} is not a saved plumb model (no model.json)`, { hint: 'create one with `plumb fit <graph…> --save <dir>`', position: { file } });
  }
  let manifest: Manifest;
  try {
    manifest = JSON.parse(text) as Manifest;
  } catch (error) {
    throw new PlumbError('E_INPUT', `${file} is not valid JSON: ${(error as Error).message}`, { position: { file }, hint: 'refit the model with `plumb fit`' });
  }
  if (manifest.format !== FORMAT || manifest.formatVersion !== FORMAT_VERSION) {
    throw new PlumbError('E_INPUT', `${file} is not a plumb model of format version ${FORMAT_VERSION}`, { position: { file }, hint: 'refit the model with this version of plumb' });
  }
  return manifest;
}

/**
 * Loads a saved model. With a graph, the entity and relation indexes are the graph's, matched to
 * the saved ones by term key; predicates the model does not know, or a graph that shares too few
 * entities with it, are refused with what differs. Entities new to the model start from the mean
 * saved input row, and the R-GCN encoder computes every embedding from the graph's edges (minus
 * `exclude`), so a new entity is built from its neighbours. Without a graph, the embeddings saved
 * with the model are used as they are.
 */
export async function loadModel(dir: string, graph?: Graph, options: LoadOptions = {}): Promise<TrainedModel> {
  const manifest = await readManifest(dir);
  const config = resolveConfig(manifest.config);
  const entityText = await fs.readFile(path.join(dir, 'entities.txt'), 'utf8').catch(() => {
    throw new PlumbError('E_INPUT', `${dir}/entities.txt is missing`, { hint: 'refit the model with `plumb fit`' });
  });
  const savedEntities = entityText.length === 0 ? [] : entityText.split('\n');
  const bytes = await fs.readFile(path.join(dir, 'weights.bin')).catch(() => {
    throw new PlumbError('E_INPUT', `${dir}/weights.bin is missing`, { hint: 'refit the model with `plumb fit`' });
  });
  const values = new Float32Array(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength));
  const expected = manifest.tensors.reduce((sum, t) => Math.max(sum, t.offset + t.shape.reduce((a, b) => a * b, 1)), 0);
  if (values.length !== expected || savedEntities.length !== manifest.entityCount) {
    throw new PlumbError('E_INPUT', `${dir} is damaged: weights.bin or entities.txt does not match model.json`, { hint: 'refit the model with `plumb fit`' });
  }
  const tensorValues = (name: string): { shape: number[]; data: Float32Array } => {
    const entry = manifest.tensors.find((t) => t.name === name);
    if (!entry) throw new PlumbError('E_INPUT', `${dir}/model.json lists no tensor ${name}`, { hint: 'refit the model with `plumb fit`' });
    const size = entry.shape.reduce((a, b) => a * b, 1);
    return { shape: entry.shape, data: values.subarray(entry.offset, entry.offset + size) };
  };

  const savedRelations = manifest.relations;
  const backend = await initBackend(options.backend ?? 'auto', graph ? graph.terms.size : manifest.entityCount);
  const d = config.dim;
  const prefix = uniquePrefix();
  const variable = (name: string, data: Float32Array, shape: number[]): tf.Variable =>
    tf.variable(tf.tensor(data, shape, 'float32'), true, `${prefix}/${name}`);

  if (!graph) {
    const dictionary = new TermDictionary();
    for (const key of savedEntities) dictionary.intern(key);
    for (const key of savedRelations) dictionary.intern(key);
    const entities = identityIndex(dictionary, savedEntities);
    const relations = relationIndex(dictionary, savedRelations);
    const weights = restoreWeights(config, tensorValues, variable, null, d);
    const emb = tensorValues('embeddings');
    const embeddings = tf.tensor2d(emb.data, [emb.shape[0]!, emb.shape[1]!]);
    return new RelationalModel(config, backend, entities, relations, manifest.history, weights, embeddings, manifest.fingerprint, savedEntities, 0, dictionary);
  }

  const { entities, relations: graphRelations } = indexGraph(graph);
  const savedRelationIndex = new Map(savedRelations.map((key, i) => [key, i]));
  const unknown = graphRelations.keys.filter((key) => !savedRelationIndex.has(key));
  if (unknown.length > 0) {
    const shown = unknown.slice(0, 5).map((k) => `<${k}>`).join(', ');
    throw new PlumbError('E_MODEL', `the model in ${dir} does not know ${unknown.length} predicate(s) of this graph: ${shown}${unknown.length > 5 ? ', …' : ''}`, {
      hint: 'refit the model on a graph that has these predicates (`plumb fit … --save`)',
    });
  }
  const relations = relationIndex(graph.terms, savedRelations);
  const entityKeys = Array.from(entities.terms, (t) => graph.terms.key(t));
  const savedIndex = new Map(savedEntities.map((key, i) => [key, i]));
  const rowOf = entityKeys.map((key) => savedIndex.get(key) ?? -1);
  const shared = rowOf.filter((r) => r >= 0).length;
  if (entities.count > 0 && shared < MIN_SHARED_ENTITIES * entities.count) {
    throw new PlumbError('E_MODEL', `this graph's dictionary differs from the model's in ${dir}: only ${shared} of its ${entities.count} entities are known to the model (fitted on ${savedEntities.length})`, {
      hint: 'the model was fitted on another graph: refit it on this one with `plumb fit`',
    });
  }
  const unseen = entities.count - shared;
  const weights = restoreWeights(config, tensorValues, variable, rowOf, d);
  if (options.exclude !== undefined && options.exclude.length !== graph.size) {
    throw new PlumbError('E_USAGE', `exclude has ${options.exclude.length} entries but the graph has ${graph.size} triples`);
  }
  const data = modelTriples(graph, entities, relations);
  const keep = new Uint8Array(data.count).fill(1);
  if (options.exclude) for (let t = 0; t < graph.size; t++) if (options.exclude[t] && data.ofTriple[t]! >= 0) keep[data.ofTriple[t]!] = 0;
  const fingerprint: Fingerprint = {
    entities: fingerprintStrings(entityKeys),
    relations: fingerprintStrings(savedRelations),
    edges: edgeFingerprint(data, keep),
  };
  let embeddings: tf.Tensor2D;
  try {
    const f = manifest.fingerprint;
    if (f.entities === fingerprint.entities && f.relations === fingerprint.relations && f.edges === fingerprint.edges) {
      const emb = tensorValues('embeddings');
      embeddings = tf.tensor2d(emb.data, [emb.shape[0]!, emb.shape[1]!]);
    } else {
      const layout = config.encoder === 'rgcn' ? new EdgeLayout(data.s, data.r, data.o, entities.count, relations.count) : null;
      embeddings = embed(config, weights, layerShapes(config, relations.count), layout ? layout.build(keep) : null);
    }
  } catch (error) {
    for (const v of weightList(weights)) v.dispose();
    return rethrowMemory(error, `computing entity embeddings for ${entities.count} entities`);
  }
  const isNew = Uint8Array.from(rowOf, (row) => (row < 0 ? 1 : 0));
  return new RelationalModel(config, backend, entities, relations, manifest.history, weights, embeddings, fingerprint, entityKeys, unseen, undefined, isNew);
}

/** Rebuilds the weights; `rowOf` maps each new entity to its saved row (-1: new, takes the mean row). */
function restoreWeights(
  config: ModelConfig,
  tensorValues: (name: string) => { shape: number[]; data: Float32Array },
  variable: (name: string, data: Float32Array, shape: number[]) => tf.Variable,
  rowOf: number[] | null,
  d: number,
): Weights {
  const saved = tensorValues('entities');
  let table = saved.data;
  let rows = saved.shape[0]!;
  if (rowOf !== null) {
    const mean = new Float64Array(d);
    for (let e = 0; e < rows; e++) for (let k = 0; k < d; k++) mean[k]! += saved.data[e * d + k]! / rows;
    table = new Float32Array(rowOf.length * d);
    rowOf.forEach((row, e) => {
      if (row >= 0) table.set(saved.data.subarray(row * d, (row + 1) * d), e * d);
      else for (let k = 0; k < d; k++) table[e * d + k] = mean[k]!;
    });
    rows = rowOf.length;
  }
  const entities = variable('entities', table, [rows, d]) as tf.Variable<tf.Rank.R2>;
  const layers = layerShapes(config, 0).map((_, l) => {
    const w0 = tensorValues(`layer${l}/w0`);
    const w = tensorValues(`layer${l}/w`);
    const layer: Weights['layers'][number] = { w0: variable(`layer${l}/w0`, w0.data, w0.shape), w: variable(`layer${l}/w`, w.data, w.shape) };
    if (config.decomposition === 'basis') {
      const a = tensorValues(`layer${l}/a`);
      layer.a = variable(`layer${l}/a`, a.data, a.shape);
    }
    return layer;
  });
  const rel = tensorValues('relations');
  const relations = variable('relations', rel.data, rel.shape) as tf.Variable<tf.Rank.R2>;
  return { entities, layers, relations };
}

function identityIndex(dictionary: TermDictionary, keys: readonly string[]): EntityIndex {
  const ofTerm = new Int32Array(dictionary.size).fill(-1);
  const terms = new Int32Array(keys.length);
  keys.forEach((key, i) => {
    const id = dictionary.id(key);
    ofTerm[id] = i;
    terms[i] = id;
  });
  return { ofTerm, terms, count: keys.length };
}

function relationIndex(dictionary: TermDictionary, keys: readonly string[]): RelationIndex {
  const ofTerm = new Int32Array(dictionary.size).fill(-1);
  keys.forEach((key, i) => {
    const id = dictionary.id(key);
    if (id >= 0) ofTerm[id] = i;
  });
  return { ofTerm, count: keys.length, keys: [...keys] };
}

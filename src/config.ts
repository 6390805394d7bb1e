import { readFile } from 'node:fs/promises';
import { dirname, isAbsolute, resolve } from 'node:path';
import { Ajv, type ErrorObject } from 'ajv';
import { PlumbError, type ErrorCode } from './errors.js';
import { REPORT_FORMATS, parseFormats, type ReportFormat } from './report/index.js';

/**
 * `plumb.config.json`: the options of `audit`, `check`, `fit` and `gate`, kept in the repository so
 * that CI and people run with the same ones. Its keys are the long flags in camelCase
 * (`--max-errors` → `maxErrors`); a flag given on the command line wins over the file.
 *
 * One typed table below is the source of the config type, its JSON Schema (validated with ajv), its
 * error messages and the flag names, so a key cannot exist in one and not the others. Paths in the
 * file are relative to the file's own folder, not to where plumb runs.
 */

type KeySpec =
  | { type: 'string' | 'path' | 'paths' | 'boolean' | 'formats'; description: string }
  | { type: 'integer' | 'number'; description: string; minimum?: number; maximum?: number; exclusiveMinimum?: number }
  | { type: 'enum'; description: string; values: readonly string[] };

export const CONFIG_KEYS = {
  schema: { type: 'paths', description: 'ontology files whose RDFS/OWL axioms the graph is checked against (--schema)' },
  shapes: { type: 'paths', description: 'SHACL shapes files (--shapes)' },
  base: { type: 'paths', description: 'gate: the graph the incoming triples are merged into (--base)' },
  model: { type: 'path', description: 'a saved model folder to score with instead of fitting one (--model)' },
  valid: { type: 'path', description: 'fit: validation triples for early stopping (--valid)' },
  out: { type: 'path', description: 'the folder reports are written to (--out)' },
  format: { type: 'formats', description: `report formats, a list or a comma-separated string of ${REPORT_FORMATS.join(', ')} or all (--format)` },
  top: { type: 'integer', minimum: 0, description: 'findings listed in the terminal and Markdown summaries (--top)' },
  failOn: { type: 'enum', values: ['error', 'warning', 'note'], description: 'check: exit 1 when a finding at or above this severity exists (--fail-on)' },
  closedWorld: { type: 'boolean', description: 'a resource without the type a domain or range asks for is an error, not a note (--closed-world)' },
  suppressions: { type: 'path', description: 'gate: the file of accepted findings (--suppressions)' },
  maxErrors: { type: 'integer', minimum: 0, description: 'gate: most findings of severity error allowed (--max-errors)' },
  maxWarnings: { type: 'integer', minimum: 0, description: 'gate: most findings of severity warning allowed (--max-warnings)' },
  maxSuspects: { type: 'integer', minimum: 0, description: 'gate: most suspects allowed (--max-suspects)' },
  minPlausibility: { type: 'number', minimum: 0, maximum: 1, description: 'gate: every scored incoming triple must be at least this plausible (--min-plausibility)' },
  folds: { type: 'integer', minimum: 2, description: 'audit: folds for out-of-fold scoring (--folds)' },
  seed: { type: 'integer', description: 'random seed, for repeatable runs on the same backend (--seed)' },
  calibrate: { type: 'boolean', description: 'audit: measure the trust figure by planting errors in a copy (--calibrate)' },
  backend: { type: 'string', description: 'the tfjs backend: wasm, cpu, … (--backend)' },
  encoder: { type: 'enum', values: ['rgcn', 'none'], description: 'R-GCN encoder, or none for plain DistMult (--encoder)' },
  dim: { type: 'integer', minimum: 1, description: 'embedding width (--dim)' },
  layers: { type: 'integer', minimum: 0, description: 'R-GCN layers (--layers)' },
  decomposition: { type: 'enum', values: ['none', 'basis', 'block'], description: 'R-GCN weight decomposition (--decomposition)' },
  bases: { type: 'integer', minimum: 1, description: 'basis decomposition: number of bases (--bases)' },
  blocks: { type: 'integer', minimum: 1, description: 'block-diagonal decomposition: number of blocks (--blocks)' },
  negatives: { type: 'integer', minimum: 1, description: 'negative samples per positive (--negatives)' },
  epochs: { type: 'integer', minimum: 1, description: 'most training epochs (--epochs)' },
  learningRate: { type: 'number', exclusiveMinimum: 0, description: 'the optimiser step size (--learning-rate)' },
  edgeSample: { type: 'number', exclusiveMinimum: 0, description: 'edges sampled per message-passing step, to bound memory (--edge-sample)' },
} as const satisfies Record<string, KeySpec>;

export type ConfigKey = keyof typeof CONFIG_KEYS;

type ValueOf<S> = S extends { type: 'paths' }
  ? string[]
  : S extends { type: 'path' | 'string' }
    ? string
    : S extends { type: 'integer' | 'number' }
      ? number
      : S extends { type: 'boolean' }
        ? boolean
        : S extends { type: 'formats' }
          ? ReportFormat[]
          : S extends { type: 'enum'; values: readonly (infer V)[] }
            ? V
            : never;

/** The config as loaded: every key optional, paths absolute, `format` a list of formats. */
export type PlumbConfig = { -readonly [K in ConfigKey]?: ValueOf<(typeof CONFIG_KEYS)[K]> };

export const CONFIG_FILE_NAME = 'plumb.config.json';

/** `maxErrors` → `--max-errors`. */
export function flagName(key: ConfigKey): string {
  return `--${key.replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`)}`;
}

function keySchema(spec: KeySpec): Record<string, unknown> {
  const description = spec.description;
  switch (spec.type) {
    case 'string':
    case 'path':
      return { description, type: 'string', minLength: 1 };
    case 'paths':
      return { description, anyOf: [{ type: 'string', minLength: 1 }, { type: 'array', items: { type: 'string', minLength: 1 } }] };
    case 'boolean':
      return { description, type: 'boolean' };
    case 'formats':
      return {
        description,
        anyOf: [
          { type: 'string', pattern: `^\\s*(${[...REPORT_FORMATS, 'md', 'all'].join('|')})\\s*(,\\s*(${[...REPORT_FORMATS, 'md', 'all'].join('|')})\\s*)*$` },
          { type: 'array', items: { enum: [...REPORT_FORMATS, 'md', 'all'] } },
        ],
      };
    case 'enum':
      return { description, enum: [...spec.values] };
    default: {
      const out: Record<string, unknown> = { description, type: spec.type };
      if (spec.minimum !== undefined) out.minimum = spec.minimum;
      if (spec.maximum !== undefined) out.maximum = spec.maximum;
      if (spec.exclusiveMinimum !== undefined) out.exclusiveMinimum = spec.exclusiveMinimum;
      return out;
    }
  }
}

/** The JSON Schema of plumb.config.json, made from the table (shipped as schemas/plumb-config.schema.json). */
export function configJsonSchema(): Record<string, unknown> {
  const properties: Record<string, unknown> = {
    $schema: { description: 'the location of this schema, for editors', type: 'string' },
  };
  for (const [key, spec] of Object.entries(CONFIG_KEYS)) properties[key] = keySchema(spec);
  return {
    $schema: 'http://json-schema.org/draft-07/schema#',
    $id: 'urn:plumb:schema:config:1',
    title: 'plumb.config.json',
    description: 'Options for plumb audit, check, fit and gate; keys are the long flags in camelCase. A flag on the command line wins over the file.',
    type: 'object',
    additionalProperties: false,
    properties,
  };
}

/** What a value of this key must be, for error messages. */
function expected(spec: KeySpec): string {
  switch (spec.type) {
    case 'string':
      return 'a non-empty string';
    case 'path':
      return 'a path (a non-empty string)';
    case 'paths':
      return 'a path or a list of paths';
    case 'boolean':
      return 'true or false';
    case 'formats':
      return `a list of formats (${REPORT_FORMATS.join(', ')}, all) or a comma-separated string of them`;
    case 'enum':
      return `one of ${spec.values.map((v) => `"${v}"`).join(', ')}`;
    default: {
      const bounds: string[] = [];
      if (spec.minimum !== undefined) bounds.push(`≥ ${spec.minimum}`);
      if (spec.exclusiveMinimum !== undefined) bounds.push(`> ${spec.exclusiveMinimum}`);
      if (spec.maximum !== undefined) bounds.push(`≤ ${spec.maximum}`);
      return `${spec.type === 'integer' ? 'an integer' : 'a number'}${bounds.length > 0 ? ` ${bounds.join(' and ')}` : ''}`;
    }
  }
}

/** Edit distance, to suggest the key a typo meant. */
function distance(a: string, b: string): number {
  const row = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    let prev = row[0]!;
    row[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const next = Math.min(row[j]! + 1, row[j - 1]! + 1, prev + (a[i - 1]!.toLowerCase() === b[j - 1]!.toLowerCase() ? 0 : 1));
      prev = row[j]!;
      row[j] = next;
    }
  }
  return row[b.length]!;
}

function nearestKey(key: string): string | undefined {
  const camel = key.replace(/^-+/, '').replace(/[-_](\w)/g, (_, c: string) => c.toUpperCase());
  let best: string | undefined;
  let bestDistance = Infinity;
  for (const candidate of Object.keys(CONFIG_KEYS)) {
    const d = distance(camel, candidate);
    if (d < bestDistance) [best, bestDistance] = [candidate, d];
  }
  return bestDistance <= Math.max(2, Math.floor(camel.length / 3)) ? best : undefined;
}

/** 1-based line and column of a UTF-16 offset in `text`. */
export function lineColumn(text: string, offset: number): { line: number; column: number } {
  let line = 1;
  let start = 0;
  for (let i = 0; i < offset && i < text.length; i++) {
    if (text.charCodeAt(i) === 10) {
      line += 1;
      start = i + 1;
    }
  }
  return { line, column: Math.min(offset, text.length) - start + 1 };
}

/**
 * Where JSON text first goes wrong, and what was expected there (RFC 8259 grammar). Only run after
 * `JSON.parse` has failed, since its messages do not always give a position.
 */
export function jsonSyntaxError(text: string): { offset: number; expected: string } | undefined {
  let i = 0;
  const ws = (): void => {
    while (i < text.length && ' \t\n\r'.includes(text[i]!)) i++;
  };
  class Stop {
    constructor(readonly expected: string) {}
  }
  const fail = (what: string): never => {
    throw new Stop(what);
  };
  const string = (): void => {
    i++; // opening quote
    while (i < text.length) {
      const c = text.charCodeAt(i);
      if (c === 34) {
        i++;
        return;
      }
      if (c < 0x20) fail('no control character inside a string (write \\n, \\t, …)');
      if (c === 92) {
        const e = text[i + 1];
        if (e === 'u') {
          if (!/^[0-9a-fA-F]{4}$/.test(text.slice(i + 2, i + 6))) {
            i += 2;
            fail('four hex digits after \\u');
          }
          i += 6;
          continue;
        }
        if (e === undefined || !'"\\/bfnrt'.includes(e)) {
          i++;
          fail('an escape: \\" \\\\ \\/ \\b \\f \\n \\r \\t or \\uXXXX');
        }
        i += 2;
        continue;
      }
      i++;
    }
    fail('a closing " for the string');
  };
  const value = (): void => {
    ws();
    const c = text[i];
    if (c === '{') {
      i++;
      ws();
      if (text[i] === '}') {
        i++;
        return;
      }
      for (;;) {
        ws();
        if (text[i] !== '"') fail('a key in double quotes');
        string();
        ws();
        if (text[i] !== ':') fail('":" after the key');
        i++;
        value();
        ws();
        if (text[i] === ',') {
          i++;
          continue;
        }
        if (text[i] === '}') {
          i++;
          return;
        }
        fail('"," or "}" after a value (no trailing comma before "}")');
      }
    }
    if (c === '[') {
      i++;
      ws();
      if (text[i] === ']') {
        i++;
        return;
      }
      for (;;) {
        value();
        ws();
        if (text[i] === ',') {
          i++;
          continue;
        }
        if (text[i] === ']') {
          i++;
          return;
        }
        fail('"," or "]" after an item');
      }
    }
    if (c === '"') return string();
    const m = /^-?(0|[1-9]\d*)(\.\d+)?([eE][+-]?\d+)?/.exec(text.slice(i, i + 400));
    if (m && m[0] !== '' && m[0] !== '-') {
      i += m[0].length;
      return;
    }
    for (const word of ['true', 'false', 'null']) {
      if (text.startsWith(word, i)) {
        i += word.length;
        return;
      }
    }
    fail(i >= text.length ? 'a value (the file ends too early)' : 'a value: an object, list, string, number, true, false or null');
  };
  try {
    value();
    ws();
    if (i < text.length) fail('the end of the file after the value');
    return undefined;
  } catch (stop) {
    if (stop instanceof Stop) return { offset: i, expected: stop.expected };
    throw stop;
  }
}

/**
 * Parses JSON read from `file`, turning a syntax error into a PlumbError with file:line:column and
 * what was expected there. A byte-order mark at the start is allowed.
 */
export function parseJsonFile(text: string, file: string, code: ErrorCode = 'E_CONFIG'): unknown {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  try {
    return JSON.parse(body);
  } catch (error) {
    const where = jsonSyntaxError(body) ?? { offset: 0, expected: 'valid JSON' };
    const { line, column } = lineColumn(body, where.offset);
    throw new PlumbError(code, `${file} is not valid JSON: expected ${where.expected}`, {
      position: { file, line, column },
      hint: 'fix the JSON at that line (JSON allows no comments and no trailing commas)',
      cause: error,
    });
  }
}

/** The line of the first `"key":` in the text, to point at a bad key; undefined when not found. */
function lineOfKey(text: string, key: string): number | undefined {
  const escaped = JSON.stringify(key).replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
  const m = new RegExp(`${escaped}\\s*:`).exec(text);
  return m ? lineColumn(text, m.index).line : undefined;
}

let configValidator: ReturnType<Ajv['compile']> | undefined;

function configError(error: ErrorObject, file: string, text: string): PlumbError {
  if (error.keyword === 'additionalProperties') {
    const key = String((error.params as { additionalProperty: string }).additionalProperty);
    const near = nearestKey(key);
    const line = lineOfKey(text, key);
    return new PlumbError('E_CONFIG', `${file}: unknown key "${key}"`, {
      position: line === undefined ? { file } : { file, line },
      hint: near ? `did you mean "${near}"? (keys are the long flags in camelCase)` : `known keys: ${Object.keys(CONFIG_KEYS).join(', ')}`,
    });
  }
  if (error.instancePath === '') {
    return new PlumbError('E_CONFIG', `${file} must hold a JSON object of options`, {
      position: { file, line: 1 },
      hint: `for example {"maxErrors": 0, "format": ["json", "html"]}`,
    });
  }
  const key = error.instancePath.split('/')[1]!.replace(/~1/g, '/').replace(/~0/g, '~') as ConfigKey;
  const spec: KeySpec | undefined = CONFIG_KEYS[key];
  const line = lineOfKey(text, key);
  return new PlumbError('E_CONFIG', `${file}: "${key}" must be ${spec ? expected(spec) : 'a string'}`, {
    position: line === undefined ? { file } : { file, line },
    hint: spec ? `${flagName(key)}: ${spec.description}` : 'see schemas/plumb-config.schema.json',
  });
}

/** Checks a parsed config object and returns it normalised: paths resolved against `baseDir`, lists as arrays. */
export function checkConfig(value: unknown, file: string, text: string, baseDir: string): PlumbConfig {
  if (!configValidator) configValidator = new Ajv({ allErrors: true, strict: true }).compile(configJsonSchema());
  if (!configValidator(value)) {
    const errors = configValidator.errors ?? [];
    // An unknown key first: it is the likelier mistake and its message names it.
    const first = errors.find((e) => e.keyword === 'additionalProperties') ?? errors.find((e) => e.instancePath !== '') ?? errors[0];
    throw first ? configError(first, file, text) : new PlumbError('E_CONFIG', `${file} is not a valid plumb config`);
  }
  const raw = value as Record<string, unknown>;
  const out: Record<string, unknown> = {};
  for (const [key, spec] of Object.entries(CONFIG_KEYS) as [ConfigKey, KeySpec][]) {
    const v = raw[key];
    if (v === undefined) continue;
    if (spec.type === 'path') out[key] = resolve(baseDir, v as string);
    else if (spec.type === 'paths') out[key] = (typeof v === 'string' ? [v] : (v as string[])).map((p) => resolve(baseDir, p));
    else if (spec.type === 'formats') out[key] = parseFormats(v as string | string[]);
    else out[key] = v;
  }
  return out as PlumbConfig;
}

/**
 * Loads the config: from `path` when given (relative to `cwd`), else `plumb.config.json` in `cwd`
 * when there is one, else an empty config. A missing file given by path, bad JSON, an unknown key
 * or a bad value is a PlumbError('E_CONFIG') naming the file, the line and the key.
 */
export async function loadConfig(path: string | undefined, cwd: string): Promise<PlumbConfig> {
  const file = path === undefined ? resolve(cwd, CONFIG_FILE_NAME) : isAbsolute(path) ? path : resolve(cwd, path);
  let text: string;
  try {
    text = await readFile(file, 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    if (path === undefined && code === 'ENOENT') return {};
    throw new PlumbError('E_CONFIG', `cannot read the config file ${file}: ${code === 'ENOENT' ? 'no such file' : (error as Error).message}`, {
      position: { file },
      hint: path === undefined ? `remove or fix ${CONFIG_FILE_NAME}` : 'check the path given with --config',
      cause: error,
    });
  }
  const value = parseJsonFile(text, file, 'E_CONFIG');
  return checkConfig(value, file, text.charCodeAt(0) === 0xfeff ? text.slice(1) : text, dirname(file));
}

/**
 * Fills in `flags` from the config for every key the user did not give on the command line
 * (`isExplicit(key)` is true for those; with commander, `cmd.getOptionValueSource(key) === 'cli'`).
 * Only keys `flags` can hold are taken: pass the command's own keys as `keys`.
 */
export function applyConfig<T extends object>(flags: T, config: PlumbConfig, keys: readonly ConfigKey[], isExplicit: (key: ConfigKey) => boolean): T {
  const out = { ...flags } as Record<string, unknown>;
  for (const key of keys) {
    if (config[key] !== undefined && !isExplicit(key)) out[key] = config[key];
  }
  return out as T;
}

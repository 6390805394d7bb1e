import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { CONFIG_KEYS, applyConfig, configJsonSchema, flagName, jsonSyntaxError, loadConfig, parseJsonFile } from '../src/config.js';
import { PlumbError } from '../src/errors.js';

const fresh = (): string => mkdtempSync(join(tmpdir(), 'plumb-config-'));

async function configError(text: string): Promise<PlumbError> {
  const dir = fresh();
  writeFileSync(join(dir, 'plumb.config.json'), text);
  try {
    await loadConfig(undefined, dir);
  } catch (error) {
    expect(error).toBeInstanceOf(PlumbError);
    return error as PlumbError;
  }
  throw new Error('expected loadConfig to fail');
}

describe('plumb.config.json', () => {
  it('is optional: no file in the folder gives an empty config', async () => {
    expect(await loadConfig(undefined, fresh())).toEqual({});
  });

  it('loads the options, resolving paths against the file’s folder and reading formats', async () => {
    const dir = fresh();
    const sub = join(dir, 'ci');
    const { mkdirSync } = await import('node:fs');
    mkdirSync(sub);
    writeFileSync(
      join(sub, 'gate.json'),
      JSON.stringify({
        $schema: '../schemas/plumb-config.schema.json',
        maxErrors: 0,
        maxSuspects: 25,
        minPlausibility: 0.02,
        schema: 'ontology/orchard.ttl',
        shapes: ['shapes/a.ttl', '/abs/b.ttl'],
        suppressions: 'accepted.json',
        format: 'json, html,md',
        closedWorld: true,
        failOn: 'warning',
        decomposition: 'basis',
      }),
    );
    const config = await loadConfig('ci/gate.json', dir);
    expect(config).toEqual({
      maxErrors: 0,
      maxSuspects: 25,
      minPlausibility: 0.02,
      schema: [join(sub, 'ontology/orchard.ttl')],
      shapes: [join(sub, 'shapes/a.ttl'), '/abs/b.ttl'],
      suppressions: join(sub, 'accepted.json'),
      format: ['json', 'html', 'markdown'],
      closedWorld: true,
      failOn: 'warning',
      decomposition: 'basis',
    });
  });

  it('names an unknown key, its file and line, and suggests the key meant', async () => {
    const error = await configError('{\n  "maxErrors": 0,\n  "max-warnings": 3\n}\n');
    expect(error.code).toBe('E_CONFIG');
    expect(error.exitCode).toBe(2);
    expect(error.message).toContain('unknown key "max-warnings"');
    expect(error.message).toContain('plumb.config.json');
    expect(error.position?.line).toBe(3);
    expect(error.hint).toContain('"maxWarnings"');
  });

  it('names a key whose value has the wrong type, and says what it must be', async () => {
    const error = await configError('{\n  "folds": "five"\n}');
    expect(error.message).toMatch(/"folds" must be an integer ≥ 2/);
    expect(error.position?.line).toBe(2);
    expect(error.hint).toContain('--folds');
    expect((await configError('{"minPlausibility": 1.5}')).message).toMatch(/"minPlausibility" must be a number ≥ 0 and ≤ 1/);
    expect((await configError('{"failOn": "fatal"}')).message).toContain('"error", "warning", "note"');
    expect((await configError('{"format": "json,pdf"}')).message).toContain('"format" must be a list of formats');
    expect((await configError('[1, 2]')).message).toContain('must hold a JSON object');
  });

  it('points at a JSON syntax error by line and column', async () => {
    const error = await configError('{\n  "maxErrors": 0,\n  "top": x\n}');
    expect(error.code).toBe('E_CONFIG');
    expect(error.position).toMatchObject({ line: 3, column: 10 });
    expect(error.message).toContain('expected a value');
    const trailing = await configError('{\n  "maxErrors": 0,\n}');
    expect(trailing.position).toMatchObject({ line: 3, column: 1 });
  });

  it('says when a config given by path does not exist', async () => {
    await expect(loadConfig('nowhere.json', fresh())).rejects.toMatchObject({ code: 'E_CONFIG', message: expect.stringContaining('no such file') });
  });

  it('ships a schema file identical to the one the table makes', () => {
    const shipped = JSON.parse(readFileSync(new URL('../schemas/plumb-config.schema.json', import.meta.url), 'utf8')) as unknown;
    // If this fails after adding a key: regenerate schemas/plumb-config.schema.json from configJsonSchema().
    expect(shipped).toEqual(configJsonSchema());
    expect(Object.keys((configJsonSchema().properties as object))).toEqual(['$schema', ...Object.keys(CONFIG_KEYS)]);
  });

  it('fills in only what the command line did not give', () => {
    const flags = { maxErrors: 5, maxWarnings: 10, out: 'reports' };
    const merged = applyConfig(flags, { maxErrors: 0, maxWarnings: 2, seed: 9 }, ['maxErrors', 'maxWarnings', 'out'], (k) => k === 'maxErrors');
    expect(merged).toEqual({ maxErrors: 5, maxWarnings: 2, out: 'reports' });
    expect(flagName('minPlausibility')).toBe('--min-plausibility');
  });
});

describe('JSON syntax positions', () => {
  it('finds where JSON goes wrong and what was expected', () => {
    expect(jsonSyntaxError('{"a": 1}')).toBeUndefined();
    expect(jsonSyntaxError('{"a": 1,}')).toMatchObject({ offset: 8 });
    expect(jsonSyntaxError('{"a" 1}')).toMatchObject({ offset: 5, expected: '":" after the key' });
    expect(jsonSyntaxError('[1, 2')).toMatchObject({ offset: 5 });
    expect(jsonSyntaxError('{"a": "b\nc"}')).toMatchObject({ offset: 8 });
    expect(jsonSyntaxError('{"a": tru}')).toMatchObject({ offset: 6 });
    expect(jsonSyntaxError('{} {}')).toMatchObject({ offset: 3, expected: 'the end of the file after the value' });
    expect(jsonSyntaxError('"\\x"')).toMatchObject({ offset: 2 });
    expect(jsonSyntaxError('')).toMatchObject({ offset: 0 });
    // Agrees with JSON.parse on what is valid.
    for (const text of ['0', '-0.5e3', '"\\u00e9"', '[[], {}]', '01', '1.', '-', '+1', '"\\u12"', 'nul']) {
      let valid = true;
      try {
        JSON.parse(text);
      } catch {
        valid = false;
      }
      expect(jsonSyntaxError(text) === undefined).toBe(valid);
    }
  });

  it('accepts a byte-order mark', () => {
    expect(parseJsonFile('\ufeff{"a": 1}', 'x.json')).toEqual({ a: 1 });
  });
});

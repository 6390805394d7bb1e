import { PlumbError } from '../errors.js';

export type InputFormat = 'ntriples' | 'nquads' | 'turtle' | 'trig' | 'csv' | 'tsv';

export const INPUT_FORMATS: readonly InputFormat[] = ['ntriples', 'nquads', 'turtle', 'trig', 'csv', 'tsv'];

/** What `--format` accepts: our names plus the usual short names and media-type words. */
const FORMAT_NAMES: Record<string, InputFormat> = {
  ntriples: 'ntriples',
  'n-triples': 'ntriples',
  nt: 'ntriples',
  nquads: 'nquads',
  'n-quads': 'nquads',
  nq: 'nquads',
  turtle: 'turtle',
  ttl: 'turtle',
  trig: 'trig',
  csv: 'csv',
  tsv: 'tsv',
  tab: 'tsv',
};

/** File extensions, after any `.gz`. `.txt` is tab-separated: the open link-prediction datasets use it. */
const EXTENSIONS: Record<string, InputFormat> = {
  nt: 'ntriples',
  ntriples: 'ntriples',
  nq: 'nquads',
  nquads: 'nquads',
  ttl: 'turtle',
  turtle: 'turtle',
  trig: 'trig',
  csv: 'csv',
  tsv: 'tsv',
  tab: 'tsv',
  txt: 'tsv',
};

/** The format a `--format` value names; a usage error listing the choices otherwise. */
export function parseFormatName(name: string): InputFormat {
  const format = FORMAT_NAMES[name.trim().toLowerCase()];
  if (format === undefined) {
    throw new PlumbError('E_USAGE', `unknown format "${name}"`, {
      hint: `use one of: ${INPUT_FORMATS.join(', ')}`,
    });
  }
  return format;
}

/** The format a file name implies, ignoring a trailing `.gz`; undefined when the extension says nothing. */
export function formatFromPath(path: string): InputFormat | undefined {
  const name = path.toLowerCase().replace(/\.gz$/, '');
  const dot = name.lastIndexOf('.');
  if (dot < 0 || dot < name.lastIndexOf('/')) return undefined;
  return EXTENSIONS[name.slice(dot + 1)];
}

/** The format to read `path` as: the explicit one, else the extension's; a one-line error when neither says. */
export function resolveFormat(path: string, explicit: InputFormat | undefined): InputFormat {
  if (explicit !== undefined) return explicit;
  const format = formatFromPath(path);
  if (format !== undefined) return format;
  const shown = path === '-' ? 'standard input' : path;
  throw new PlumbError('E_FORMAT', `cannot tell the format of ${shown} from its name`, {
    position: { file: path },
    hint: `pass --format (${INPUT_FORMATS.join(', ')}), or name the file with a known extension (.nt .nq .ttl .trig .csv .tsv, optionally .gz)`,
  });
}

export function isLineBased(format: InputFormat): boolean {
  return format === 'ntriples' || format === 'nquads';
}

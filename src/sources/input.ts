import { createHash, type Hash } from 'node:crypto';
import { createReadStream, promises as fsp } from 'node:fs';
import { Readable, pipeline } from 'node:stream';
import { createGunzip } from 'node:zlib';
import { PlumbError } from '../errors.js';

/**
 * Opens one input as a stream of bytes: a file, or standard input for `-`, decompressed on the fly
 * when the bytes start with the gzip magic number (whatever the name says). The size and SHA-256
 * are those of the bytes as stored, counted as they stream past.
 */
export interface OpenedInput {
  /** The path as given (`-` for standard input). */
  path: string;
  /** Bytes on disk, when known before reading (for progress). */
  size: number | undefined;
  chunks: AsyncIterable<Uint8Array>;
  /** Bytes read so far, as stored (compressed when gzipped). */
  readonly bytes: number;
  compressed: boolean;
  /** SHA-256 of the stored bytes; call after `chunks` is exhausted. */
  sha256(): string;
}

const READ_CHUNK = 1 << 18;

export async function openInput(
  path: string,
  stdin: NodeJS.ReadableStream | undefined,
): Promise<OpenedInput> {
  let size: number | undefined;
  let source: AsyncIterable<Uint8Array>;
  if (path === '-') {
    source = (stdin ?? process.stdin) as AsyncIterable<Uint8Array>;
  } else {
    const stat = await fsp.stat(path).catch((error: NodeJS.ErrnoException) => {
      throw openError(path, error);
    });
    if (stat.isDirectory()) {
      throw new PlumbError('E_INPUT', `${path} is a directory, not a graph file`, {
        position: { file: path },
        hint: 'name the files inside it instead, e.g. `' + path.replace(/\/$/, '') + '/*.nt`',
      });
    }
    size = stat.size;
    source = createReadStream(path, { highWaterMark: READ_CHUNK });
  }
  return new StoredBytes(path, size, source);
}

class StoredBytes implements OpenedInput {
  bytes = 0;
  compressed = false;
  /** Readable once. */
  readonly chunks: AsyncIterable<Uint8Array>;
  private readonly hash: Hash = createHash('sha256');
  constructor(
    readonly path: string,
    readonly size: number | undefined,
    private readonly source: AsyncIterable<Uint8Array>,
  ) {
    this.chunks = this.read();
  }

  sha256(): string {
    return this.hash.copy().digest('hex');
  }

  private async *counted(): AsyncGenerator<Uint8Array> {
    try {
      for await (const chunk of this.source) {
        const bytes = typeof chunk === 'string' ? Buffer.from(chunk) : chunk;
        this.bytes += bytes.length;
        this.hash.update(bytes);
        yield bytes;
      }
    } catch (error) {
      throw openError(this.path, error as NodeJS.ErrnoException);
    }
  }

  private async *read(): AsyncGenerator<Uint8Array> {
    const raw = this.counted();
    const first = await raw.next();
    if (first.done) return;
    const head = first.value;
    if (head.length >= 2 && head[0] === 0x1f && head[1] === 0x8b) {
      this.compressed = true;
      yield* gunzip(this.path, head, raw);
      return;
    }
    yield head;
    yield* raw;
  }
}

async function* gunzip(
  path: string,
  head: Uint8Array,
  rest: AsyncIterator<Uint8Array>,
): AsyncGenerator<Uint8Array> {
  async function* all(): AsyncGenerator<Uint8Array> {
    yield head;
    for (let next = await rest.next(); !next.done; next = await rest.next()) yield next.value;
  }
  const inflate = createGunzip({ chunkSize: READ_CHUNK });
  // pipeline forwards a read error into the gunzip stream, so the loop below sees every failure.
  pipeline(Readable.from(all()), inflate, () => {});
  try {
    for await (const chunk of inflate) yield chunk as Buffer;
  } catch (error) {
    if (error instanceof PlumbError) throw error;
    const message = (error as Error).message;
    throw new PlumbError('E_INPUT', `the gzip data is truncated or damaged (${message})`, {
      position: { file: path },
      hint: 'download or copy the file again, or check it with `gzip -t`',
    });
  }
}

function openError(path: string, error: NodeJS.ErrnoException): PlumbError {
  if (error instanceof PlumbError) return error;
  const where = { position: { file: path } };
  switch (error.code) {
    case 'ENOENT':
      return new PlumbError('E_INPUT', `no such file: ${path}`, {
        ...where,
        hint: 'check the path; use `-` to read standard input',
      });
    case 'EISDIR':
      return new PlumbError('E_INPUT', `${path} is a directory, not a graph file`, {
        ...where,
        hint: 'name the files inside it instead',
      });
    case 'EACCES':
    case 'EPERM':
      return new PlumbError('E_INPUT', `cannot read ${path}: permission denied`, {
        ...where,
        hint: 'check the file permissions',
      });
    default:
      return new PlumbError('E_INPUT', `cannot read ${path}: ${error.message}`, where);
  }
}

/**
 * uvsky/oifits/node: reading OIFITS files from a path (Node only).
 *
 * @module
 */
import { readFile } from 'node:fs/promises';
import type { OifitsDataset } from './dataset.js';
import { type ReadOifitsOptions, readOifits } from './read.js';

export * from './index.js';

/**
 * Reads an OIFITS file from disk.
 *
 * @param path - file path
 * @param options - as for {@link readOifits}; `name` defaults to the path
 * @returns the dataset
 * @throws OifitsError for a malformed file (with the path as `location.file`); the fs error if it cannot be read
 *
 * Notes: reads the whole file into memory, then parses it with {@link readOifits}.
 *
 * @example
 * ```ts
 * const ds = await readOifitsFile('night1.oifits');
 * ```
 */
export async function readOifitsFile(path: string, options: ReadOifitsOptions = {}): Promise<OifitsDataset> {
  const buf = await readFile(path);
  const bytes = new Uint8Array(buf.buffer, buf.byteOffset, buf.byteLength);
  return readOifits(bytes, { ...options, name: options.name ?? path });
}

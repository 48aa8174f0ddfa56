/**
 * Reading the inputs of a command: OIFITS files and model files (.json in the uvsky model format; .mjs / .js
 * modules, or .ts under tsx, exporting a Model as default or as `model`).
 *
 * @module
 */
import { readFile } from 'node:fs/promises';
import { extname, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { InputError, ModelError } from '../../errors.js';
import { modelFromJSON } from '../../model/json.js';
import { Model } from '../../model/model.js';
import type { OifitsDataset } from '../../oifits/dataset.js';
import { readOifits } from '../../oifits/read.js';

/** Reads a file, with an InputError naming it when it cannot be read. */
export async function readBytes(path: string, cwd: string): Promise<Uint8Array> {
  try {
    const b = await readFile(resolve(cwd, path));
    return new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new InputError(
      `cannot read ${path}: ${code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'it is a directory' : (e as Error).message}`,
      { file: path },
    );
  }
}

/** Reads and validates an OIFITS file. */
export async function loadDataset(path: string, cwd: string): Promise<OifitsDataset> {
  return readOifits(await readBytes(path, cwd), { name: path });
}

const MODULE_EXTENSIONS = new Set(['.mjs', '.js', '.cjs', '.ts', '.mts', '.cts']);
const TS_EXTENSIONS = new Set(['.ts', '.mts', '.cts']);

/** True for an object that behaves as a uvsky Model (possibly from another copy of the package). */
function modelLike(x: unknown): x is Pick<Model, 'toJSON'> & { node: unknown } {
  return (
    typeof x === 'object' &&
    x !== null &&
    typeof (x as { toJSON?: unknown }).toJSON === 'function' &&
    typeof (x as { node?: unknown }).node === 'object'
  );
}

/**
 * Loads a model file.
 *
 * @param path - `.json` (a uvsky model JSON document, as `model.toJSON()` writes it), or a module `.mjs`, `.js`,
 *   `.cjs` (or `.ts`, `.mts` when uvsky runs under tsx) whose default export or `model` export is a Model
 * @param cwd - directory `path` is relative to
 * @returns the model (a model built by another copy of uvsky is carried over through its JSON form)
 * @throws InputError when the file cannot be read, ModelError when it holds no valid model
 */
export async function loadModel(path: string, cwd: string): Promise<Model> {
  const ext = extname(path).toLowerCase();
  const abs = resolve(cwd, path);
  if (ext === '.json') {
    const text = new TextDecoder().decode(await readBytes(path, cwd));
    let json: unknown;
    try {
      json = JSON.parse(text);
    } catch (e) {
      throw new ModelError(`model file ${path} is not valid JSON: ${(e as Error).message}`, { file: path });
    }
    try {
      return modelFromJSON(json);
    } catch (e) {
      throw new ModelError(`model file ${path}: ${(e as Error).message}`, { file: path });
    }
  }
  if (!MODULE_EXTENSIONS.has(ext)) {
    throw new InputError(
      `model file ${path}: unknown extension '${ext || '(none)'}'; give a .json model document or a .mjs / .js module (.ts under tsx)`,
      { file: path },
    );
  }
  await readBytes(path, cwd); // a clear message for a missing file before the loader's own
  let mod: Record<string, unknown>;
  try {
    mod = (await import(pathToFileURL(abs).href)) as Record<string, unknown>;
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (
      TS_EXTENSIONS.has(ext) &&
      (code === 'ERR_UNKNOWN_FILE_EXTENSION' || code === 'ERR_UNKNOWN_MODULE_FORMAT')
    ) {
      throw new InputError(
        `model file ${path} is TypeScript, which plain node cannot load (it needs tsx): run uvsky under tsx (npx tsx node_modules/uvsky/dist/cli/uvsky.js ...), or write the model as a .mjs module or as .json`,
        { file: path },
      );
    }
    throw new InputError(`model file ${path} could not be loaded: ${(e as Error).message}`, { file: path });
  }
  const nested = mod.default as Record<string, unknown> | undefined;
  const candidates = [mod.default, mod.model, nested?.default, nested?.model];
  const found = candidates.find(modelLike);
  if (found === undefined) {
    const names = Object.keys(mod).join(', ') || 'nothing';
    throw new ModelError(
      `model file ${path} exports no Model as default or as 'model' (it exports ${names}); end it with 'export default model'`,
      { file: path },
    );
  }
  if (found instanceof Model) return found;
  try {
    return modelFromJSON(found.toJSON());
  } catch (e) {
    throw new ModelError(`model file ${path}: its model could not be carried over: ${(e as Error).message}`, {
      file: path,
    });
  }
}

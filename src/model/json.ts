/**
 * The JSON form of models: {@link modelToJSON} (behind `Model.prototype.toJSON`) writes a model as plain JSON
 * data and {@link modelFromJSON} reads it back, checking every field.
 *
 * The document is `{ format: 'uvsky-model', version: 1, model: <node> }`. A node is the model's own plain-data
 * node: `{ kind, <slots in SLOT_NAMES order>, of }`, where `of` is a node (weight, shift, stretch, rotate,
 * incline), an array of one or more nodes (sum) or an array of two nodes (convolve), and is absent for
 * primitives. A slot is a finite number, a parameter `{ kind: 'param', name, value, min?, max?, fixed }`, or a
 * slot expression: any other object with a string `kind` whose fields are numbers, strings, booleans, nested
 * slots or arrays of these. Fields of a node that are neither slots nor `of` (data such as sample tables
 * or pixel grids) follow the slots and are written the same way, typed arrays as arrays.
 *
 * Paths in error messages are property paths from the document root, written the way `canonicalise()` writes
 * model paths but rooted at `model` instead of the root node's kind: `model.of[2].east` is the `east` slot of
 * the third child of the root node, `model.of.diameter.min` the lower bound of a parameter in a child's slot.
 *
 * @module
 */
import { ModelError, showValue } from '../errors.js';
import { Model } from './model.js';
import { MAX_MODEL_DEPTH, type ModelNode, type NodeKind, SLOT_NAMES } from './nodes.js';
import { isParam, type Param, param } from './param.js';

/** The `format` tag of a model JSON document. */
export const MODEL_JSON_FORMAT = 'uvsky-model';

/** The `version` of the model JSON documents this build of uvsky writes and reads. */
export const MODEL_JSON_VERSION = 1;

/** Any JSON value. */
export type JsonValue = null | boolean | number | string | readonly JsonValue[] | JsonObject;

/** A JSON object. */
export type JsonObject = { readonly [key: string]: JsonValue };

/**
 * A parameter as written in JSON. An unbounded side is omitted (`min` for -Infinity, `max` for +Infinity),
 * because JSON has no infinities; on reading, an omitted or `null` bound is unbounded.
 */
export type ParamJSON = {
  readonly kind: 'param';
  readonly name: string;
  readonly value: number;
  readonly min?: number;
  readonly max?: number;
  readonly fixed: boolean;
};

/** A model node as written in JSON: `{ kind, <slots>, of? }`. */
export type NodeJSON = { readonly kind: string; readonly [field: string]: JsonValue };

/** A model JSON document, as returned by `Model.prototype.toJSON`. */
export type ModelJSON = {
  readonly format: typeof MODEL_JSON_FORMAT;
  readonly version: typeof MODEL_JSON_VERSION;
  readonly model: NodeJSON;
};

/** How many children each operator kind takes; every other kind of SLOT_NAMES is a primitive. */
const CHILDREN: Readonly<Record<string, 'one' | 'many' | 'two'>> = Object.freeze({
  weight: 'one',
  shift: 'one',
  stretch: 'one',
  rotate: 'one',
  incline: 'one',
  sum: 'many',
  convolve: 'two',
});

/**
 * Kinds whose nodes hold nothing but their slots and children. Any other field of such a node is an error (a
 * misspelt slot); nodes of other kinds may carry data fields (sample tables, pixel grids), which are copied.
 */
const CLOSED_KINDS: ReadonlySet<string> = new Set([
  'point',
  'disk',
  'gaussian',
  'ring',
  'ellipse',
  ...Object.keys(CHILDREN),
]);

const SLOT_HINT =
  "a finite number, a param ({ kind: 'param', name, value, min?, max?, fixed? }) or a slot expression ({ kind, ... })";

// ---------- writing ----------

function numberToJSON(x: number, path: string): number {
  if (!Number.isFinite(x)) {
    throw new ModelError(`toJSON: ${path} is ${showValue(x)}, which JSON cannot hold; use a finite number`, {
      modelPath: path,
    });
  }
  return x === 0 ? 0 : x; // JSON.stringify writes -0 as 0; do the same in the object form
}

function paramToJSON(p: Param, path: string): ParamJSON {
  const out: Record<string, JsonValue> = { kind: 'param', name: p.name, value: numberToJSON(p.value, path) };
  if (p.min !== Number.NEGATIVE_INFINITY) out['min'] = numberToJSON(p.min, `${path}.min`);
  if (p.max !== Number.POSITIVE_INFINITY) out['max'] = numberToJSON(p.max, `${path}.max`);
  out['fixed'] = p.fixed;
  return out as ParamJSON;
}

function fieldToJSON(x: unknown, path: string): JsonValue {
  if (typeof x === 'number') return numberToJSON(x, path);
  if (typeof x === 'string' || typeof x === 'boolean') return x;
  if (Array.isArray(x)) return x.map((y, i) => fieldToJSON(y, `${path}[${i}]`));
  if (ArrayBuffer.isView(x) && !(x instanceof DataView)) {
    return Array.from(x as unknown as ArrayLike<number>, (y, i) => fieldToJSON(y, `${path}[${i}]`));
  }
  if (isParam(x)) return paramToJSON(x, path);
  if (typeof x === 'object' && x !== null && typeof (x as { kind?: unknown }).kind === 'string') {
    // a slot expression: kind first, then its fields in their own order
    const entries: [string, JsonValue][] = [['kind', (x as { kind: string }).kind]];
    for (const [k, v] of Object.entries(x))
      if (k !== 'kind') entries.push([k, fieldToJSON(v, `${path}.${k}`)]);
    return Object.fromEntries(entries);
  }
  throw new ModelError(
    `toJSON: ${path} holds ${showValue(x)}, which has no JSON form; expected ${SLOT_HINT}`,
    {
      modelPath: path,
    },
  );
}

function nodeToJSON(node: ModelNode, path: string): NodeJSON {
  if (!Object.hasOwn(SLOT_NAMES, node.kind)) {
    throw new ModelError(
      `toJSON: ${path}.kind: unknown node kind ${showValue(node.kind)}; known kinds: ${knownKinds()}`,
      { modelPath: `${path}.kind` },
    );
  }
  const slots = SLOT_NAMES[node.kind];
  const fields = node as unknown as Readonly<Record<string, unknown>>;
  const entries: [string, JsonValue][] = [['kind', node.kind]];
  for (const name of slots) entries.push([name, fieldToJSON(fields[name], `${path}.${name}`)]);
  // data fields of a node (sample tables, pixel grids) follow its slots, in the node's own order
  for (const [k, v] of Object.entries(fields)) {
    if (k !== 'kind' && k !== 'of' && !slots.includes(k)) entries.push([k, fieldToJSON(v, `${path}.${k}`)]);
  }
  if ('of' in node) {
    const of: unknown = node.of;
    entries.push([
      'of',
      Array.isArray(of)
        ? of.map((c: ModelNode, i) => nodeToJSON(c, `${path}.of[${i}]`))
        : nodeToJSON(of as ModelNode, `${path}.of`),
    ]);
  }
  return Object.fromEntries(entries) as NodeJSON;
}

/**
 * Writes a model as a JSON document (plain data, ready for `JSON.stringify`).
 *
 * @param model - the model to write (anything with a model `node`)
 * @returns a fresh, unfrozen `{ format: 'uvsky-model', version: 1, model: <node> }`
 * @throws ModelError when a slot expression holds a value JSON cannot represent (a non-finite number)
 *
 * Notes: the node mirrors `model.node` field for field (slots in SLOT_NAMES order, then `of`), so every node
 * kind, present or added later, is written without changes here. Parameters are written with their name,
 * value, finite bounds and fixed flag; an infinite bound is left out. `-0` is written as `0`, as
 * `JSON.stringify` would. `Model.prototype.toJSON` calls this, so `JSON.stringify(m)` gives the document text.
 *
 * @example
 * ```ts
 * modelToJSON(disk({ diameter: param('d', 2, { min: 0 }) }).shift(1, 0));
 * // { format: 'uvsky-model', version: 1, model: { kind: 'shift', east: 1, north: 0,
 * //   of: { kind: 'disk', diameter: { kind: 'param', name: 'd', value: 2, min: 0, fixed: false } } } }
 * ```
 */
export function modelToJSON(model: Pick<Model, 'node'>): ModelJSON {
  return {
    format: MODEL_JSON_FORMAT,
    version: MODEL_JSON_VERSION,
    model: nodeToJSON(model.node, 'model'),
  };
}

// ---------- reading ----------

function fail(path: string, problem: string, extra: { parameter?: string } = {}): never {
  throw new ModelError(`modelFromJSON: ${path}: ${problem}`, { modelPath: path, ...extra });
}

function isRecord(x: unknown): x is Readonly<Record<string, unknown>> {
  return typeof x === 'object' && x !== null && !Array.isArray(x);
}

function has(o: Readonly<Record<string, unknown>>, key: string): boolean {
  return Object.hasOwn(o, key) && o[key] !== undefined;
}

function checkFields(
  o: Readonly<Record<string, unknown>>,
  allowed: readonly string[],
  path: string,
  what: string,
) {
  for (const k of Object.keys(o)) {
    if (!allowed.includes(k)) {
      fail(
        path === '' ? k : `${path}.${k}`,
        `unexpected field in ${what}; its fields are ${allowed.join(', ')}`,
      );
    }
  }
}

function readNumber(x: unknown, path: string, expected: string): number {
  if (typeof x !== 'number' || !Number.isFinite(x)) {
    const hint = typeof x === 'string' ? ' (numbers are written as JSON numbers, not strings)' : '';
    fail(path, `expected ${expected}, got ${showValue(x)}${hint}`);
  }
  return x;
}

function readBound(o: Readonly<Record<string, unknown>>, key: 'min' | 'max', path: string): number {
  const x = o[key];
  if (x === undefined || x === null)
    return key === 'min' ? Number.NEGATIVE_INFINITY : Number.POSITIVE_INFINITY;
  if (typeof x !== 'number' || Number.isNaN(x)) {
    fail(
      `${path}.${key}`,
      `expected a number, or the field left out (or null) for no bound, got ${showValue(x)}`,
    );
  }
  return x;
}

const PARAM_FIELDS = ['kind', 'name', 'value', 'min', 'max', 'fixed'] as const;

function readParam(o: Readonly<Record<string, unknown>>, path: string): Param {
  checkFields(o, PARAM_FIELDS, path, 'a param');
  const name = o['name'];
  if (typeof name !== 'string')
    fail(`${path}.name`, `expected a parameter name (a string), got ${showValue(name)}`);
  if (!has(o, 'value')) fail(`${path}.value`, `missing; parameter '${name}' needs a finite number`);
  const value = readNumber(o['value'], `${path}.value`, 'a finite number');
  const min = readBound(o, 'min', path);
  const max = readBound(o, 'max', path);
  const fixed = o['fixed'] ?? false;
  if (typeof fixed !== 'boolean') {
    fail(`${path}.fixed`, `expected true, false or the field left out (false), got ${showValue(fixed)}`);
  }
  if (min > max)
    fail(`${path}.min`, `${min} is greater than max ${max}; give min <= max`, { parameter: name });
  try {
    return param(name, value, { min, max, fixed });
  } catch (e) {
    if (e instanceof ModelError) fail(path, e.message, { parameter: name });
    throw e;
  }
}

function tooDeep(path: string, depth: number): void {
  if (depth > MAX_MODEL_DEPTH)
    fail(path, `nested more than ${MAX_MODEL_DEPTH} levels deep; a model is never that deep`);
}

function readField(x: unknown, path: string, depth = 0): unknown {
  tooDeep(path, depth);
  if (typeof x === 'number') return readNumber(x, path, 'a finite number');
  if (typeof x === 'string' || typeof x === 'boolean') return x;
  if (Array.isArray(x)) return x.map((y, i) => readField(y, `${path}[${i}]`, depth + 1));
  if (isRecord(x)) return readSlot(x, path, '', depth + 1);
  fail(path, `expected a number, string, boolean, slot or array of these, got ${showValue(x)}`);
}

function readSlot(x: unknown, path: string, where = '', depth = 0): unknown {
  tooDeep(path, depth);
  if (typeof x === 'number') return readNumber(x, path, `${SLOT_HINT}${where}`);
  if (!isRecord(x)) {
    const hint = typeof x === 'string' ? ' (numbers are written as JSON numbers, not strings)' : '';
    fail(path, `expected ${SLOT_HINT}${where}, got ${showValue(x)}${hint}`);
  }
  const kind = x['kind'];
  if (typeof kind !== 'string')
    fail(`${path}.kind`, `expected a string naming the slot kind, got ${showValue(kind)}`);
  if (kind === 'param') return readParam(x, path);
  // a slot expression: copied field by field; new Model(...) checks that its kind and fields make sense
  const entries: [string, unknown][] = [['kind', kind]];
  for (const [k, v] of Object.entries(x))
    if (k !== 'kind') entries.push([k, readField(v, `${path}.${k}`, depth + 1)]);
  return Object.fromEntries(entries);
}

function knownKinds(): string {
  return Object.keys(SLOT_NAMES).join(', ');
}

function readNode(x: unknown, path: string, depth = 0): ModelNode {
  tooDeep(path, depth);
  if (!isRecord(x)) fail(path, `expected a model node ({ kind, ... }), got ${showValue(x)}`);
  const kind = x['kind'];
  if (typeof kind !== 'string' || !Object.hasOwn(SLOT_NAMES, kind)) {
    fail(`${path}.kind`, `unknown node kind ${showValue(kind)}; known kinds: ${knownKinds()}`);
  }
  const slots = SLOT_NAMES[kind as NodeKind];
  const children = Object.hasOwn(CHILDREN, kind) ? CHILDREN[kind] : undefined;
  const what = `a ${kind} node`;
  const extra = Object.keys(x).filter((k) => k !== 'kind' && k !== 'of' && !slots.includes(k));
  if (CLOSED_KINDS.has(kind)) checkFields(x, ['kind', ...slots, ...(children ? ['of'] : [])], path, what);
  else if (!children && Object.hasOwn(x, 'of'))
    fail(`${path}.of`, `unexpected field: ${what} has no children`);
  const entries: [string, unknown][] = [['kind', kind]];
  for (const name of slots) {
    if (!has(x, name)) {
      const typo = extra.length > 0 ? ` (found ${extra.map((k) => `'${k}'`).join(', ')} instead?)` : '';
      fail(`${path}.${name}`, `missing from ${what}${typo}; expected ${SLOT_HINT}`);
    }
    entries.push([name, readSlot(x[name], `${path}.${name}`, ` for the ${name} slot of ${what}`, depth + 1)]);
  }
  for (const k of extra) entries.push([k, readField(x[k], `${path}.${k}`, depth + 1)]);
  if (children !== undefined) {
    const of = x['of'];
    if (children === 'one') {
      if (!isRecord(of))
        fail(`${path}.of`, `expected the model node that ${what} acts on, got ${showValue(of)}`);
      entries.push(['of', readNode(of, `${path}.of`, depth + 1)]);
    } else {
      const count =
        children === 'two' ? 'an array of exactly two model nodes' : 'an array of one or more model nodes';
      if (!Array.isArray(of)) fail(`${path}.of`, `expected ${count}, got ${showValue(of)}`);
      if (children === 'two' ? of.length !== 2 : of.length === 0) {
        fail(`${path}.of`, `expected ${count}, got an array of ${of.length}`);
      }
      entries.push(['of', of.map((c, i) => readNode(c, `${path}.of[${i}]`, depth + 1))]);
    }
  }
  return Object.fromEntries(entries) as unknown as ModelNode;
}

/** Re-roots a ModelError thrown by `new Model(...)` (paths start at the root kind) at the JSON path `model`. */
function reroot(e: ModelError, rootKind: string): ModelError {
  const p = e.location.modelPath;
  if (p === undefined || !(p === rootKind || p.startsWith(`${rootKind}.`)) || !e.message.startsWith(p))
    return e;
  const path = `model${p.slice(rootKind.length)}`;
  return new ModelError(`modelFromJSON: ${path}${e.message.slice(p.length)}`, {
    ...e.location,
    modelPath: path,
  });
}

/**
 * Reads a model from its JSON document, checking every field.
 *
 * @param json - the document as an object (e.g. `JSON.parse(text)` or `m.toJSON()`) or as JSON text
 * @returns a new {@link Model}, canonically equal to the one written and with the same `toString()`,
 *   parameters (name, value, bounds, fixed flag) and ties
 * @throws ModelError naming the path of the first bad field (e.g. `model.of[2].east`) and what would be
 *   valid: not an object, wrong `format` or `version`, unknown node kind (the message lists the known kinds),
 *   missing, extra or mistyped fields, a parameter with min > max or a value outside its bounds, and every
 *   value that `new Model(...)` refuses (a negative diameter, tied parameters with different settings)
 *
 * Notes: the input is only read, never changed or kept; the model is rebuilt through `new Model(node)`, which
 * checks values and domains as the factories do. Node kinds are those of SLOT_NAMES; a kind not listed among
 * the operators here is read as a primitive (no `of`), so new primitive kinds need no change. Nodes of the
 * foundation kinds (point, disk, gaussian, ring, ellipse and the operators) may hold no other fields, so a
 * misspelt slot is reported; nodes of other kinds may carry data fields, which are copied like slot
 * expressions and checked by `new Model(...)`. Slot
 * expressions are copied field by field, with parameters inside them read as parameters; whether they make
 * sense is left to `new Model(...)`. A bound left out or `null` is unbounded (-Infinity for `min`,
 * +Infinity for `max`); `fixed` left out is false.
 *
 * @example
 * ```ts
 * const m = disk({ diameter: param('d', 2, { min: 0 }) }).shift(1, 0);
 * modelFromJSON(JSON.parse(JSON.stringify(m))).toString();
 * // "disk({ diameter: param('d', 2, { min: 0 }) }).shift(1, 0)"
 * modelFromJSON({ format: 'uvsky-model', version: 1, model: { kind: 'disk', diameter: 'abc' } });
 * // throws ModelError: modelFromJSON: model.diameter: expected a finite number, a param (...) ..., got "abc"
 * ```
 */
export function modelFromJSON(json: unknown): Model {
  let doc = json;
  if (typeof json === 'string') {
    try {
      doc = JSON.parse(json);
    } catch (e) {
      throw new ModelError(`modelFromJSON: the text is not valid JSON (${(e as Error).message})`, {
        argument: 'json',
      });
    }
  }
  if (!isRecord(doc)) {
    throw new ModelError(
      `modelFromJSON: expected a model document { format: '${MODEL_JSON_FORMAT}', version: ${MODEL_JSON_VERSION}, model: { kind, ... } } or its JSON text, got ${showValue(doc)}`,
      { argument: 'json' },
    );
  }
  checkFields(doc, ['format', 'version', 'model'], '', 'a model document');
  if (doc['format'] !== MODEL_JSON_FORMAT) {
    fail('format', `expected '${MODEL_JSON_FORMAT}', got ${showValue(doc['format'])}`);
  }
  if (doc['version'] !== MODEL_JSON_VERSION) {
    const v = doc['version'];
    const newer = typeof v === 'number' && v > MODEL_JSON_VERSION ? ' (written by a newer uvsky?)' : '';
    fail(
      'version',
      `expected ${MODEL_JSON_VERSION}, got ${showValue(v)}${newer}; this uvsky reads version ${MODEL_JSON_VERSION}`,
    );
  }
  if (!has(doc, 'model')) fail('model', 'missing; expected the root model node { kind, ... }');
  const node = readNode(doc['model'], 'model');
  try {
    return new Model(node);
  } catch (e) {
    throw e instanceof ModelError ? reroot(e, node.kind) : e;
  }
}

/**
 * Rendering a specification to SVG with the optional `vega` and `vega-lite` packages, loaded only when asked.
 *
 * @module
 */
import { UvskyError } from '../errors.js';
import type { PlotSpec } from './spec.js';

/** The packages could not be loaded, or they failed to render. */
export class PlotError extends UvskyError {}

/** What uvsky uses of the `vega-lite` package. */
interface VegaLiteModule {
  compile(spec: unknown): { spec: unknown };
}
/** What uvsky uses of the `vega` package. */
interface VegaModule {
  parse(spec: unknown): unknown;
  View: new (
    runtime: unknown,
    options: { renderer: string },
  ) => { toSVG(): Promise<string>; finalize(): void };
}

/** Loads a module by name; the default is the runtime's dynamic import. */
export type ModuleLoader = (name: string) => Promise<unknown>;

/** Options of {@link toSvg}. */
export interface ToSvgOptions {
  /** How to load `vega` and `vega-lite` (default: dynamic `import()`); for bundlers or tests. */
  readonly load?: ModuleLoader;
}

const importModule: ModuleLoader = (name) => import(/* @vite-ignore */ name);

function namespace<T>(mod: unknown): T {
  const m = mod as { default?: unknown } | undefined;
  // a CommonJS build seen through import() puts its exports on .default
  return (m && typeof m === 'object' && 'default' in m && m.default ? m.default : m) as T;
}

async function load<T>(name: string, loader: ModuleLoader, key: string): Promise<T> {
  let mod: unknown;
  try {
    mod = await loader(name);
  } catch (e) {
    throw new PlotError(
      `toSvg: the optional package '${name}' could not be loaded (${(e as Error)?.message ?? e}); ` +
        "install it with 'npm install vega vega-lite' to render SVG, or render the Vega-Lite JSON elsewhere",
      { argument: 'spec' },
    );
  }
  const direct = mod as Record<string, unknown> | undefined;
  const ns = direct && typeof direct[key] === 'function' ? (direct as T) : namespace<T>(mod);
  if (!ns || typeof (ns as Record<string, unknown>)[key] !== 'function') {
    throw new PlotError(
      `toSvg: the package '${name}' has no function ${key}; is it the Vega project's package?`,
      {
        argument: 'spec',
      },
    );
  }
  return ns;
}

/**
 * Renders a Vega-Lite specification to an SVG document.
 *
 * @param spec - a Vega-Lite specification (from the plot functions, or any other)
 * @param options - `load`, to load the packages another way
 * @returns the SVG text
 * @throws PlotError when `vega` or `vega-lite` is not installed, or when they cannot compile or render the spec
 *
 * Notes: `vega` and `vega-lite` are optional dependencies of uvsky, imported the first time this is called.
 * Without a canvas package, text widths are estimated, so labels may sit a little off.
 * @example
 * ```ts
 * const svg = await toSvg(uvCoveragePlot(dataset)); // '<svg ...'
 * ```
 */
export async function toSvg(spec: PlotSpec, options: ToSvgOptions = {}): Promise<string> {
  const loader = options.load ?? importModule;
  const vl = await load<VegaLiteModule>('vega-lite', loader, 'compile');
  const vega = await load<VegaModule>('vega', loader, 'parse');
  let view: { toSVG(): Promise<string>; finalize(): void };
  try {
    view = new vega.View(vega.parse(vl.compile(spec).spec), { renderer: 'none' });
  } catch (e) {
    throw new PlotError(
      `toSvg: vega-lite could not compile the specification: ${(e as Error)?.message ?? e}`,
      {
        argument: 'spec',
      },
    );
  }
  try {
    return await view.toSVG();
  } finally {
    view.finalize();
  }
}

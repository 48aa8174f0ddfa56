// Browser smoke test of the built package: headless Chromium (Debian's /usr/bin/chromium, driven by
// playwright-core) loads a page that imports dist/index.js as an ES module from a local node:http server,
// evaluates a model and reports the result. The package's own dependencies are bare specifiers in dist/; the
// page maps them (an import map) to ES-module bundles that esbuild makes of the installed packages, as a
// bundler or a CDN would for a browser user. Run by .ci/run after the build; skips with a message when
// chromium is not installed.
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { createServer } from 'node:http';
import { tmpdir } from 'node:os';
import { dirname, extname, join, normalize } from 'node:path';
import { fileURLToPath } from 'node:url';

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
const TIMEOUT_MS = 60_000;

if (!existsSync(CHROMIUM)) {
  console.log(`browser smoke test skipped: no chromium at ${CHROMIUM} (apt-get install chromium)`);
  process.exit(0);
}
if (!existsSync(join(ROOT, 'dist', 'index.js'))) {
  console.error('browser smoke test: dist/index.js is missing; run npm run build first');
  process.exit(1);
}

// the bare specifiers the built ESM files import
const bare = new Set();
for (const f of readdirSync(join(ROOT, 'dist'))) {
  if (!f.endsWith('.js')) continue;
  for (const m of readFileSync(join(ROOT, 'dist', f), 'utf8').matchAll(/from\s+['"]([^./'"][^'"]*)['"]/g))
    bare.add(m[1]);
}
const { build } = await import('esbuild');
const vendor = new Map();
for (const name of bare) {
  const out = await build({
    stdin: { contents: `export * from '${name}';`, resolveDir: ROOT },
    bundle: true,
    format: 'esm',
    write: false,
    platform: 'browser',
    logLevel: 'silent',
  });
  vendor.set(`/vendor/${encodeURIComponent(name)}.js`, out.outputFiles[0].text);
}
const importMap = {
  imports: Object.fromEntries([...bare].map((n) => [n, `/vendor/${encodeURIComponent(n)}.js`])),
};

/**
 * The page: a model's V^2 and closure phase, and a shifted Gaussian against its closed form computed in the page
 * (tests/smoke/closed-form.mjs), so the phase ramps are checked in the browser, in WebAssembly or, under a content
 * security policy that forbids compiling it, in JavaScript.
 */
const page = (csp) => `<!doctype html><meta charset="utf-8"><title>uvsky browser smoke test</title>
${csp ? `<meta http-equiv="Content-Security-Policy" content="${csp}">` : ''}
<script type="importmap">${JSON.stringify(importMap)}</script>
<script type="module">
  try {
    const { disk, gaussian, point, sum } = await import('/dist/index.js');
    const m = sum(disk({ diameter: 2 }), point().weight(0.1).shift(3, 0));
    const v2 = Array.from(m.vis2([0, 5e7], [0, 0]));
    const cp = Array.from(m.closurePhase([5e7], [0], [0], [5e7]));
    const { shiftedGaussianError } = await import('/smoke/closed-form.mjs');
    const worst = shiftedGaussianError(gaussian);
    let wasm = true;
    try { new WebAssembly.Module(new Uint8Array([0, 97, 115, 109, 1, 0, 0, 0])); } catch { wasm = false; }
    window.__result = { v2, cp, worst, wasm, model: m.toString() };
  } catch (e) {
    window.__result = { error: String(e && e.stack || e) };
  }
</script>`;
const PAGES = {
  '/': page(''),
  // no 'wasm-unsafe-eval': the page may not compile WebAssembly, so the library takes its JavaScript kernels
  '/csp.html': page("script-src 'self' 'unsafe-inline'"),
};

const TYPES = { '.js': 'text/javascript', '.map': 'application/json', '.html': 'text/html' };
const server = createServer((req, res) => {
  const path = normalize(decodeURIComponent(new URL(req.url, 'http://localhost').pathname));
  if (PAGES[path] !== undefined) {
    res.writeHead(200, { 'content-type': 'text/html' }).end(PAGES[path]);
    return;
  }
  if (vendor.has(path)) {
    res.writeHead(200, { 'content-type': 'text/javascript' }).end(vendor.get(path));
    return;
  }
  if (path === '/smoke/closed-form.mjs') {
    res.writeHead(200, { 'content-type': 'text/javascript' }).end(readFileSync(join(ROOT, 'tests', path)));
    return;
  }
  const file = join(ROOT, path);
  if (!path.startsWith('/dist/') || !existsSync(file)) {
    res.writeHead(404).end('not found');
    return;
  }
  res
    .writeHead(200, { 'content-type': TYPES[extname(file)] ?? 'application/octet-stream' })
    .end(readFileSync(file));
});
await new Promise((ok) => server.listen(0, '127.0.0.1', ok));
const { port } = server.address();

const { chromium } = await import('playwright-core');
const profile = mkdtempSync(join(tmpdir(), 'uvsky-chromium-'));
let context;
let failed = false;
try {
  // a fresh profile directory (playwright passes it to chromium as --user-data-dir)
  context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    timeout: TIMEOUT_MS,
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
  for (const [path, wantWasm] of [
    ['/', true],
    ['/csp.html', false],
  ]) {
    const tab = await context.newPage();
    const errors = [];
    tab.on('pageerror', (e) => errors.push(String(e)));
    await tab.goto(`http://127.0.0.1:${port}${path}`, { timeout: TIMEOUT_MS });
    await tab.waitForFunction(() => window.__result !== undefined, null, { timeout: TIMEOUT_MS });
    const result = await tab.evaluate(() => window.__result);
    if (result.error) throw new Error(`the page ${path} failed: ${result.error}`);
    const [v0, v1] = result.v2;
    if (Math.abs(v0 - 1) > 1e-12 || !(v1 > 0 && v1 < 1))
      throw new Error(`${path}: unexpected V^2 ${result.v2}`);
    if (!(Math.abs(result.cp[0]) > 1e-6))
      throw new Error(`${path}: the companion should give a non-zero closure phase: ${result.cp}`);
    // shifted Gaussian against exp(-(pi fwhm q)^2 / (4 ln 2)) exp(-2 pi i q.x) (CONVENTIONS.md), to 1e-14
    if (!(result.worst < 1e-14))
      throw new Error(`${path}: shifted Gaussian off its closed form by ${result.worst}`);
    if (result.wasm !== wantWasm)
      throw new Error(`${path}: WebAssembly compiles: ${result.wasm}, expected ${wantWasm}`);
    if (errors.length > 0) throw new Error(`${path}: page errors: ${errors.join('; ')}`);
    console.log(
      `browser smoke test passed at ${path} (chromium ${context.browser()?.version() ?? ''}, WebAssembly ${result.wasm ? 'allowed' : 'forbidden by the page'}): ${result.model}, V^2 = ${result.v2.map((x) => x.toFixed(6)).join(', ')}, closure phase ${result.cp[0].toFixed(4)} deg, shifted Gaussian within ${result.worst.toExponential(1)} of its closed form`,
    );
    await tab.close();
  }
} catch (e) {
  failed = true;
  console.error(`browser smoke test failed: ${e?.stack ?? e}`);
} finally {
  await context?.close();
  server.close();
  rmSync(profile, { recursive: true, force: true });
}
process.exit(failed ? 1 : 0);

/**
 * The `uvsky` command line, run in-process through `main` with an in-memory io, and once as a child process
 * (the source under tsx, and the built bin when dist/ exists) for the exit codes and the shebang. The numbers
 * checked come from the library's own functions (simulate, readOifits), which their own tests pin down.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { parseGridAxis } from '../../src/cli/commands/fit.js';
import { EXIT } from '../../src/cli/commands/io.js';
import { startBar } from '../../src/cli/commands/progress.js';
import { disk, param, point, sum } from '../../src/index.js';
import { readOifits } from '../../src/oifits/index.js';
import { run, workdir } from './helpers.js';

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const SRC_INDEX = join(ROOT, 'src', 'index.ts');

const truth = sum(disk({ diameter: 2.5 }), point().weight(0.2).shift(3, 1.5));
const start = sum(
  disk({ diameter: param('diameter', 2, { min: 0, max: 10 }) }),
  point()
    .weight(param('flux', 0.1, { min: 0, max: 1 }))
    .shift(param('east', 2.6), param('north', 1.2)),
);

function observed(): string {
  const dir = workdir();
  writeFileSync(join(dir, 'truth.json'), JSON.stringify(truth.toJSON()));
  writeFileSync(join(dir, 'start.json'), JSON.stringify(start.toJSON()));
  return dir;
}

describe('uvsky inspect', () => {
  it('lists targets, tables, channels, baselines, triangles and counts', async () => {
    const dir = workdir();
    const r = await run(['inspect', 'plan.fits'], dir);
    expect(r.code).toBe(EXIT.ok);
    expect(r.out).toContain('Wren Tertius');
    expect(r.out).toMatch(/OI_VIS2\s+18\s+FERNLIGHT\s+MOSSBANK/);
    expect(r.out).toMatch(/FERNLIGHT\s+4\s+1\.55\s+1\.76/);
    expect(r.out).toMatch(/MB1-MB2\s+12\s+12/);
    expect(r.out).toMatch(/MB2-MB3-MB4\s+12/);
    expect(r.out).toMatch(/t3phi\s+48\s+0\s+0/);
  });

  it('prints the same summary as JSON with --json', async () => {
    const r = await run(['inspect', 'plan.fits', '--json'], workdir());
    const s = JSON.parse(r.out);
    expect(s.targets[0].name).toBe('Wren Tertius');
    expect(s.counts.find((c: { observable: string }) => c.observable === 'vis2').entries).toBe(72);
    expect(s.baselines).toHaveLength(6);
  });
});

describe('uvsky simulate', () => {
  it('writes a file whose V^2 are the model V^2 on the template coverage', async () => {
    const dir = observed();
    const r = await run(['simulate', 'plan.fits', '--model', 'truth.json', '--out', 'obs.fits'], dir);
    expect(r.code).toBe(EXIT.ok);
    const ds = readOifits(new Uint8Array(readFileSync(join(dir, 'obs.fits'))));
    const v2 = truth.vis2(ds.vis2.u, ds.vis2.v);
    ds.vis2.value.forEach((x, k) => {
      expect(x).toBeCloseTo(v2[k]!, 12);
    });
  });

  it('loads a model from a module exporting it as default', async () => {
    const dir = workdir();
    const file = join(dir, 'model.mts');
    writeFileSync(
      file,
      `import { disk } from ${JSON.stringify(SRC_INDEX)};\nexport default disk({ diameter: 1.7 });\n`,
    );
    const r = await run(['simulate', 'plan.fits', '-m', 'model.mts', '-o', 'obs.fits', '--json'], dir);
    expect(r.code).toBe(EXIT.ok);
    expect(JSON.parse(r.out).model).toBe('disk({ diameter: 1.7 })');
  });
});

describe('uvsky fit', () => {
  it('recovers the parameters of simulated data and prints them as a table or as JSON', async () => {
    const dir = observed();
    await run(
      ['simulate', 'plan.fits', '--model', 'truth.json', '--out', 'obs.fits', '--noise', '--seed', '5'],
      dir,
    );
    const table = await run(['fit', 'obs.fits', '--model', 'start.json', '--observables', 'vis2,t3phi'], dir);
    expect(table.code).toBe(EXIT.ok);
    const row = /^diameter\s+([\d.]+)\s/m.exec(table.out);
    expect(Math.abs(Number(row?.[1]) - 2.5)).toBeLessThan(0.05);
    expect(table.out).toContain('reduced chi2');
    const json = JSON.parse(
      (await run(['fit', 'obs.fits', '-m', 'start.json', '--json', '--save', 'best.json'], dir)).out,
    );
    const byName = Object.fromEntries(json.parameters.map((p: { name: string }) => [p.name, p]));
    // simulated with noise of the planned errors: the truth lies within 5 sigma of the estimate
    for (const [name, value] of Object.entries({ diameter: 2.5, flux: 0.2, east: 3, north: 1.5 })) {
      expect(Math.abs(byName[name].value - value)).toBeLessThan(5 * byName[name].uncertainty);
    }
    expect(JSON.parse(readFileSync(join(dir, 'best.json'), 'utf8')).format).toBe('uvsky-model');
  });

  it('runs a grid of starts and reports the distinct minima', async () => {
    const dir = observed();
    await run(['simulate', 'plan.fits', '--model', 'truth.json', '--out', 'obs.fits'], dir);
    const r = await run(
      ['fit', 'obs.fits', '-m', 'start.json', '--grid', 'east=1:5:5', '--grid', 'north=-0.5:3.5:5', '--json'],
      dir,
    );
    expect(r.code).toBe(EXIT.ok);
    const json = JSON.parse(r.out);
    expect(json.grid.axes.map((a: { name: string }) => a.name)).toEqual(['east', 'north']);
    // noise-free data and a node at the truth (east 3, north 1.5): the best minimum fits exactly
    expect(json.grid.minima[0].chi2).toBeLessThan(1e-6);
    expect(json.parameters.find((p: { name: string }) => p.name === 'east').value).toBeCloseTo(3, 6);
  });

  it('turns NAME=FROM:TO:COUNT into evenly spaced values, ends included', () => {
    expect(parseGridAxis('east=-2:2:5')).toEqual(['east', [-2, -1, 0, 1, 2]]);
    expect(() => parseGridAxis('east=-2:2')).toThrow(/NAME=FROM:TO:COUNT/);
  });
});

describe('uvsky plot', () => {
  it('writes Vega-Lite JSON for the data, the model, the residuals and the image', async () => {
    const dir = observed();
    await run(['simulate', 'plan.fits', '--model', 'truth.json', '--out', 'obs.fits'], dir);
    const r = await run(
      ['plot', 'obs.fits', '--model', 'truth.json', '--out', 'plots', '--no-svg', '--pixels', '16'],
      dir,
    );
    expect(r.code).toBe(EXIT.ok);
    const files = readdirSync(join(dir, 'plots')).sort();
    expect(files).toEqual(
      ['closure-phase', 'image', 'residuals', 'uv-coverage', 'vis2', 'visamp'].map((n) => `${n}.vl.json`),
    );
    const image = JSON.parse(readFileSync(join(dir, 'plots', 'image.vl.json'), 'utf8'));
    expect(image.data.values).toHaveLength(16 * 16);
  });
});

describe('errors and exit codes', () => {
  it('exits 2 with the usage for a wrong command line', async () => {
    const dir = workdir();
    for (const argv of [
      [],
      ['frobnicate'],
      ['inspect'],
      ['fit', 'plan.fits'],
      ['inspect', 'plan.fits', '--bogus'],
    ]) {
      const r = await run(argv, dir);
      expect(r.code, argv.join(' ')).toBe(EXIT.usage);
      expect(r.err.length, argv.join(' ')).toBeGreaterThan(0);
    }
    expect((await run(['fit', 'plan.fits'], dir)).err).toContain('--model is required');
  });

  it('exits 1 naming the file when an input is missing or not OIFITS', async () => {
    const dir = workdir();
    writeFileSync(join(dir, 'junk.fits'), 'not a FITS file');
    const missing = await run(['inspect', 'nothing.fits'], dir);
    expect(missing.code).toBe(EXIT.failed);
    expect(missing.err).toContain('cannot read nothing.fits: no such file');
    const junk = await run(['inspect', 'junk.fits'], dir);
    expect(junk.code).toBe(EXIT.failed);
    expect(junk.err).toContain('OifitsError');
  });

  it('exits 1 when a model file exports no model, listing what it exports', async () => {
    const dir = workdir();
    writeFileSync(join(dir, 'empty.mjs'), 'export const diameter = 2;\n');
    const r = await run(['simulate', 'plan.fits', '-m', 'empty.mjs', '-o', 'x.fits'], dir);
    expect(r.code).toBe(EXIT.failed);
    expect(r.err).toContain("exports no Model as default or as 'model' (it exports diameter)");
  });
});

describe('the progress bar', () => {
  it('draws on an interactive terminal and stays silent when piped', () => {
    let drawn = '';
    const tty = Object.assign(
      {
        write: (s: string) => {
          drawn += s;
          return true;
        },
        cursorTo: () => true,
        clearLine: () => true,
        moveCursor: () => true,
      },
      { isTTY: true, columns: 100 },
    );
    const bar = startBar(
      {
        out: () => {},
        err: () => {},
        interactive: true,
        cwd: '.',
        progressStream: tty as unknown as NodeJS.WritableStream,
      },
      'fit',
      false,
    );
    bar.update({ fraction: 0.5, bestChi2: 12.5, step: 3 });
    bar.stop();
    expect(drawn).toContain('50%');
    let piped = '';
    const quiet = startBar(
      { out: () => {}, err: (t) => (piped += t), interactive: false, cwd: '.' },
      'fit',
      false,
    );
    quiet.update({ fraction: 0.5, bestChi2: 1, step: 1 });
    quiet.stop();
    expect(piped).toBe('');
  });
});

describe('the uvsky program', () => {
  const TSX = join(ROOT, 'node_modules', '.bin', 'tsx');
  it('exits with the codes of main when run as a process (sources under tsx)', () => {
    const dir = workdir();
    const ok = spawnSync(TSX, [join(ROOT, 'src', 'cli', 'uvsky.ts'), 'inspect', 'plan.fits', '--json'], {
      cwd: dir,
      encoding: 'utf8',
    });
    expect(ok.status).toBe(0);
    expect(JSON.parse(ok.stdout).version).toBe(2);
    const bad = spawnSync(TSX, [join(ROOT, 'src', 'cli', 'uvsky.ts'), 'inspect'], {
      cwd: dir,
      encoding: 'utf8',
    });
    expect(bad.status).toBe(2);
  });

  const BIN = join(ROOT, 'dist', 'cli', 'uvsky.js');
  it.skipIf(!existsSync(BIN))(
    'is built with a shebang, and tells how to load a .ts model under plain node',
    () => {
      expect(readFileSync(BIN, 'utf8').startsWith('#!/usr/bin/env node\n')).toBe(true);
      const dir = workdir();
      writeFileSync(join(dir, 'model.ts'), 'export default 1;\n');
      const r = spawnSync(
        process.execPath,
        [BIN, 'simulate', 'plan.fits', '-m', 'model.ts', '-o', 'x.fits'],
        {
          cwd: dir,
          encoding: 'utf8',
        },
      );
      expect(r.status).toBe(1);
      expect(r.stderr).toContain('needs tsx');
    },
  );
});

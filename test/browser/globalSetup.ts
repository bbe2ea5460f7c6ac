/**
 * Serve the built app (dist/) with vite preview on a free port, and write the files the tests
 * load (a small trace, a line table from the demo's true constants, a malformed file, a file
 * with markup in its name and title) into a temporary folder.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync, existsSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { preview, type PreviewServer } from 'vite';
import type { TestProject } from 'vitest/node';
import { lineTableSerialize } from '../../src/io/lineTable';
import { modelFileParse } from '../../src/io/modelFile';
import { bandLines } from '../../src/physics/bandLines';

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
    fixtureDir: string;
  }
}

const root = fileURLToPath(new URL('../..', import.meta.url));

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const port = (s.address() as { port: number }).port;
      s.close(() => resolve(port));
    });
  });
}

/** Mulberry32 (seeded). */
function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function writeFixtures(dir: string): void {
  // A small two-column trace: Gaussian absorption lines every 0.5 cm^-1 in transmittance.
  const rows = ['wavenumber_cm-1,transmittance'];
  for (let k = 0; k <= 20000; k++) {
    const x = 1100 + k * 0.001;
    let a = 0;
    for (let c = 1100.25; c < 1120; c += 0.5) a += 0.4 * Math.exp(-0.5 * ((x - c) / 0.003) ** 2);
    rows.push(`${x.toFixed(6)},${(10 ** -a).toFixed(6)}`);
  }
  writeFileSync(join(dir, 'small-trace.csv'), rows.join('\n') + '\n');

  // Line table: lines of the demo's true model (K'' <= 4, J'' <= 30, strong ones) with seeded
  // Gaussian noise of 0.0003 cm^-1, so a fit from the first-guess model converges.
  const truth = modelFileParse(readFileSync(join(root, 'public/demo/truth.json'), 'utf8')).model;
  const lines = bandLines({ ...truth, jMax: 30, kMax: 4 }, { minIntensity: 0.05 });
  const r = rng(11);
  const assignments = [];
  for (let i = 0; i < lines.count; i++) {
    const g = Math.sqrt(-2 * Math.log(1 - r())) * Math.cos(2 * Math.PI * r());
    assignments.push({
      id: `t${i + 1}`,
      jUpper: lines.jUpper[i],
      kUpper: lines.kUpper[i],
      jLower: lines.jLower[i],
      kLower: lines.kLower[i],
      observedCm1: Number((lines.wavenumberCm1[i] + 0.0003 * g).toFixed(6)),
      uncertaintyCm1: 0.0003,
      isBlended: false,
      isExcluded: false,
      note: '',
    });
  }
  writeFileSync(join(dir, 'truth-lines.csv'), lineTableSerialize(assignments, { shape: truth.shape }));

  writeFileSync(join(dir, 'broken.csv'), 'this is not,a spectrum\nhello,world\nfoo,bar\n');
  // Markup in the title of a JCAMP-DX file (its name carries markup too; see the test).
  const jdx = [
    '##TITLE=<img src=x onerror="window.__xss=1"><script>window.__xss=2</script>',
    '##JCAMP-DX=4.24',
    '##DATA TYPE=INFRARED SPECTRUM',
    '##XUNITS=1/CM',
    '##YUNITS=TRANSMITTANCE',
    '##FIRSTX=1100',
    '##LASTX=1101',
    '##NPOINTS=101',
    '##XFACTOR=1',
    '##YFACTOR=1',
    '##XYDATA=(X++(Y..Y))',
  ];
  for (let k = 0; k < 101; k += 1)
    jdx.push(`${(1100 + k * 0.01).toFixed(2)} ${(0.9 - 0.5 * Math.exp(-0.5 * ((k - 50) / 3) ** 2)).toFixed(4)}`);
  jdx.push('##END=');
  writeFileSync(join(dir, 'hostile.jdx'), jdx.join('\n') + '\n');
}

let server: PreviewServer | null = null;
let dir = '';

export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  if (!existsSync(join(root, 'dist/index.html')))
    throw new Error('browser tests: dist/ is missing; run `vite build` first (npm run test:browser does)');
  dir = mkdtempSync(join(tmpdir(), 'ladder-bench-browser-'));
  writeFixtures(dir);
  const port = await freePort();
  server = await preview({
    root,
    configFile: join(root, 'vite.config.ts'),
    logLevel: 'warn',
    preview: { port, strictPort: true, host: '127.0.0.1', open: false },
  });
  project.provide('baseUrl', `http://127.0.0.1:${port}`);
  project.provide('fixtureDir', dir);
  return async () => {
    await server?.close();
    rmSync(dir, { recursive: true, force: true });
  };
}

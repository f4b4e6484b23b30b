/**
 * Demo data: harbour.csv — water monitoring in an invented harbour.
 *
 * Scenario (fictional). Twenty-four moored buoys in the harbour of a made-up
 * port town carry an optical probe that records a baseline-corrected
 * absorbance spectrum of the water every hour: 100 channels from 350 nm to
 * 746 nm in 4 nm steps (columns `a350` … `a746`). Each row is one buoy-hour.
 * `reading` identifies it (`b07-2031` = buoy 7, hour 2031) and `regime` names
 * the water regime the harbour master assigned to that hour:
 *
 *   tidal-inflow      clear sea water on the flood tide        300 rows, spread 1.0
 *   sheltered-basin   still water behind the breakwater        250 rows, spread 0.6
 *   storm-mixing      stirred-up water after a storm           200 rows, spread 2.0
 *   river-plume       turbid river water, highly variable      250 rows, spread 4.0
 *   algal-bloom       bloom inside the plume: same centre as
 *                     river-plume, 1/8 of its spread           150 rows, spread 0.5
 *   estuary-gradient  hours along the salt-wedge mixing line:
 *                     a curved 1-D path through feature space  340 rows
 *   sensor-fault      fouled probes: scattered points with a
 *                     spike over a few neighbouring channels    10 rows
 *
 * (spread = standard deviation per latent dimension.) The structure lives in
 * a 10-dimensional latent space; a fixed random linear map carries it into
 * the 100 channels, and small isotropic noise is added, so a PCA to 50
 * components keeps it. Numbers have 6 significant digits; the row order is
 * shuffled. Everything comes from one seeded `Rng`, so running
 *
 *   npx tsc -p . && node dist/demo-data/generate.js [output.csv]
 *
 * rewrites demo-data/harbour.csv (or the given path) byte for byte.
 */
import { dirname, basename, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Rng } from '../src/core/rng.js';
import { writeFileAtomic } from '../src/io/atomic.js';

/** Seed of the one generator used for everything below. */
export const HARBOUR_SEED = 20_310_707;

const LATENT = 10;
const CHANNELS = 100;
const FIRST_NM = 350;
const STEP_NM = 4;
const BUOYS = 24;
/** Sensor noise per channel, in latent units (before scaling to absorbance). */
const NOISE = 0.05;
/** Latent units → absorbance units. */
const SCALE = 0.01;

interface Group {
  regime: string;
  count: number;
  draw: (rng: Rng, i: number, count: number) => Float64Array;
}

/** Point at `scale · e_axis` (an axis of the latent space). */
function axisCentre(axis: number, scale: number): Float64Array {
  const c = new Float64Array(LATENT);
  c[axis] = scale;
  return c;
}

function gaussianAround(centre: Float64Array, spread: number): Group['draw'] {
  return (rng) => {
    const z = new Float64Array(LATENT);
    for (let k = 0; k < LATENT; k++) z[k] = centre[k] + spread * rng.normal();
    return z;
  };
}

/**
 * Salt-wedge mixing line: a half-turn arc in latent axes 5–6 that also rises
 * and bends along axis 7, centred at −25·e4; points spaced evenly in t with
 * a little jitter in every direction.
 */
function mixingLine(rng: Rng, i: number, count: number): Float64Array {
  const t = (i + 0.5) / count;
  const z = new Float64Array(LATENT);
  z[4] = -25;
  z[5] = 18 * Math.cos(Math.PI * t);
  z[6] = 18 * Math.sin(Math.PI * t);
  z[7] = 12 * t + 5 * Math.sin(2 * Math.PI * t);
  for (let k = 0; k < LATENT; k++) z[k] += 0.3 * rng.normal();
  return z;
}

/** Fouled probe: anywhere in a wide box of the latent space. */
function faultPoint(rng: Rng): Float64Array {
  const z = new Float64Array(LATENT);
  for (let k = 0; k < LATENT; k++) z[k] = 80 * rng.next() - 40;
  return z;
}

const PLUME_CENTRE = axisCentre(3, 30);

const GROUPS: Group[] = [
  { regime: 'tidal-inflow', count: 300, draw: gaussianAround(axisCentre(0, 30), 1.0) },
  { regime: 'sheltered-basin', count: 250, draw: gaussianAround(axisCentre(2, 30), 0.6) },
  { regime: 'storm-mixing', count: 200, draw: gaussianAround(axisCentre(1, 30), 2.0) },
  { regime: 'river-plume', count: 250, draw: gaussianAround(PLUME_CENTRE, 4.0) },
  { regime: 'algal-bloom', count: 150, draw: gaussianAround(PLUME_CENTRE, 0.5) },
  { regime: 'estuary-gradient', count: 340, draw: mixingLine },
  { regime: 'sensor-fault', count: 10, draw: faultPoint },
];

interface Row {
  regime: string;
  values: Float64Array;
}

/** Fixed random linear map, LATENT × CHANNELS, entries N(0, 1/LATENT). */
function latentMap(rng: Rng): Float64Array {
  const w = new Float64Array(LATENT * CHANNELS);
  const s = 1 / Math.sqrt(LATENT);
  for (let i = 0; i < w.length; i++) w[i] = s * rng.normal();
  return w;
}

/** A smooth absorbance baseline falling with wavelength. */
function baseline(channel: number): number {
  const nm = FIRST_NM + STEP_NM * channel;
  return 0.05 + 0.6 * Math.exp(-(nm - FIRST_NM) / 120);
}

function toChannels(z: Float64Array, w: Float64Array, rng: Rng): Float64Array {
  const x = new Float64Array(CHANNELS);
  for (let c = 0; c < CHANNELS; c++) {
    let s = NOISE * rng.normal();
    for (let k = 0; k < LATENT; k++) s += z[k] * w[k * CHANNELS + c];
    x[c] = baseline(c) + SCALE * s;
  }
  return x;
}

/** A fouled probe reads high over 6–10 neighbouring channels. */
function addSpike(x: Float64Array, rng: Rng): void {
  const width = 6 + rng.int(5);
  const start = rng.int(CHANNELS - width);
  const height = 0.5 + rng.next();
  for (let c = start; c < start + width; c++) x[c] += height;
}

function shuffle<T>(items: T[], rng: Rng): void {
  for (let i = items.length - 1; i > 0; i--) {
    const j = rng.int(i + 1);
    const tmp = items[i];
    items[i] = items[j];
    items[j] = tmp;
  }
}

/** `b07-2031`: buoy number and a per-buoy running hour, unique per row. */
function readingIds(n: number, rng: Rng): string[] {
  const hour = new Int32Array(BUOYS);
  for (let b = 0; b < BUOYS; b++) hour[b] = 1000 + rng.int(2000);
  const ids: string[] = [];
  for (let i = 0; i < n; i++) {
    const b = rng.int(BUOYS);
    hour[b] += 1 + rng.int(3);
    ids.push(`b${String(b + 1).padStart(2, '0')}-${hour[b]}`);
  }
  return ids;
}

/** 6 significant digits, shortest form (`0.5`, not `0.500000`). */
function format6(v: number): string {
  const r = Number(v.toPrecision(6));
  return r === 0 ? '0' : String(r);
}

/** The whole CSV text of the demo data set (deterministic: depends on nothing but the code). */
export function harbourCsv(): string {
  const rng = new Rng(HARBOUR_SEED);
  const w = latentMap(rng);
  const rows: Row[] = [];
  for (const g of GROUPS) {
    for (let i = 0; i < g.count; i++) {
      const values = toChannels(g.draw(rng, i, g.count), w, rng);
      if (g.regime === 'sensor-fault') addSpike(values, rng);
      rows.push({ regime: g.regime, values });
    }
  }
  shuffle(rows, rng);
  const ids = readingIds(rows.length, rng);
  const names: string[] = [];
  for (let c = 0; c < CHANNELS; c++) names.push(`a${FIRST_NM + STEP_NM * c}`);
  const lines: string[] = [['reading', 'regime', ...names].join(',')];
  for (let i = 0; i < rows.length; i++) {
    const cells = Array.from(rows[i].values, format6);
    lines.push(`${ids[i]},${rows[i].regime},${cells.join(',')}`);
  }
  return `${lines.join('\n')}\n`;
}

/** Write harbour.csv to `path` (atomically). */
export async function writeHarbourCsv(path: string): Promise<void> {
  await writeFileAtomic(path, harbourCsv());
}

/** demo-data/harbour.csv in the project, whether run from source or from dist/. */
function defaultPath(): string {
  const here = dirname(fileURLToPath(import.meta.url));
  const root = basename(dirname(here)) === 'dist' ? resolve(here, '..', '..') : resolve(here, '..');
  return resolve(root, 'demo-data', 'harbour.csv');
}

async function main(): Promise<void> {
  const out = process.argv[2] ?? defaultPath();
  await writeHarbourCsv(out);
  process.stdout.write(`wrote ${out}\n`);
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(resolve(process.argv[1])).href) {
  main().catch((err: unknown) => {
    process.stderr.write(`${err instanceof Error ? err.message : String(err)}\n`);
    process.exitCode = 1;
  });
}

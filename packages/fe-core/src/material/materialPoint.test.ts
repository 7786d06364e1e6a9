import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { materialPointCli } from '../cli/material-point';
import { createLagoudas2012, type Lagoudas2012Material } from './lagoudas2012';
import { MATERIAL_POINT_COLUMNS, materialPointCsv, runMaterialPoint } from './materialPoint';
import { assertCheck } from './materialPointTesting';
import type { Lagoudas2012Constants } from './lagoudas2012Calibration';
import type { Material, MaterialPointInput, MaterialPointOutput, MaterialReport } from './types';

const L = {
  E_A: 60000, E_M: 45000, nu: 0.33, alpha_A: 1.1e-5, alpha_M: 6.6e-6, T_ref: 20,
  Ms0: 10, Mf0: -5, As0: 15, Af0: 30, C_M: 7, C_A: 7, sigma_star: 300,
  H_min: 0.02, H_sat: 0.05, k_t: 0.01, n1: 1, n2: 1, n3: 1, n4: 1,
};

/** Wraps a material and fails any update whose axial strain step exceeds `limit` (to exercise cut-backs). */
class Fussy implements Material<Lagoudas2012Constants> {
  readonly model = 'fussy';
  readonly stateSize: number;
  readonly params: Lagoudas2012Constants;
  constructor(
    private readonly inner: Lagoudas2012Material,
    private readonly limit: number,
  ) {
    this.stateSize = inner.stateSize;
    this.params = inner.params;
  }
  initState(s: Float64Array, o: number, t: number): void {
    this.inner.initState(s, o, t);
  }
  report(s: Float64Array, o: number, out: MaterialReport): void {
    this.inner.report(s, o, out);
  }
  update(input: MaterialPointInput, so: Float64Array, oo: number, s: Float64Array, no: number, out: MaterialPointOutput): void {
    this.inner.update(input, so, oo, s, no, out);
    if (Math.abs(input.strain[0] - input.strainOld[0]) > this.limit) {
      out.ok = false;
      out.message = 'step too large';
    }
  }
}

describe('material-point driver', () => {
  it('starts stress-free at the first temperature and reports strain from there', () => {
    const r = runMaterialPoint(createLagoudas2012(L), {
      control: 'strain',
      path: [{ value: 0, temperature: 37 }, { value: 0.002, temperature: 37, increments: 4 }],
    });
    expect(r.ok).toBe(true);
    expect(r.rows).toHaveLength(5);
    expect(Math.abs(r.rows[0].stress)).toBeLessThan(1e-9);
    assertCheck({ suite: 'SMA: Lagoudas 2012', name: 'material point, elastic austenite σ = E_A ε at 0.2 %', computed: r.rows[4].stress, target: L.E_A * 0.002, unit: 'MPa', tolerance: 1e-9, source: 'closed form, Hooke’s law in uniaxial stress' });
    expect(r.rows[4].time).toBe(1);
  });

  it('cuts failing increments back and still lands on every requested increment', () => {
    // constant H (k_t = 0): monotone legs are then independent of the step size
    const Lc = { ...L, H_min: 0.04, H_sat: 0.04, k_t: 0 };
    const path = { control: 'strain' as const, path: [{ value: 0, temperature: 37 }, { value: 0.06, temperature: 37, increments: 6 }, { value: 0, temperature: 37, increments: 6 }] };
    const fine = runMaterialPoint(createLagoudas2012(Lc), path);
    const cut = runMaterialPoint(new Fussy(createLagoudas2012(Lc), 1.5e-3), path);
    expect(cut.ok, cut.message).toBe(true);
    expect(cut.cutBacks).toBe(12);
    expect(cut.rows).toHaveLength(fine.rows.length);
    // strain control of a rate-independent model: the monotone legs end on the same states
    // (up to the O((σ_r/σ)²) path dependence the flow-direction regularisation brings in)
    expect(Math.abs(cut.rows[6].stress - fine.rows[6].stress)).toBeLessThan(1e-3);
    expect(cut.rows.at(-1)!.xi).toBe(0);
  });

  it('reports failure with the leg and increment when cut-backs are exhausted', () => {
    const r = runMaterialPoint(new Fussy(createLagoudas2012(L), 1e-9), {
      control: 'strain',
      path: [{ value: 0, temperature: L.T_ref }, { value: 0.01, temperature: L.T_ref, increments: 1 }],
    });
    expect(r.ok).toBe(false);
    expect(r.message).toMatch(/leg 1, increment 1 of 1: step too large/);
  });

  it('writes the CSV header and one row per converged increment', () => {
    const r = runMaterialPoint(createLagoudas2012(L), {
      control: 'stress',
      path: [{ value: 0, temperature: 40 }, { value: 100, temperature: 40, increments: 3 }],
    });
    const lines = materialPointCsv(r.rows).trim().split('\n');
    expect(lines[0]).toBe(MATERIAL_POINT_COLUMNS.join(','));
    expect(lines[0].startsWith('time,strain,stress,temperature,xi')).toBe(true);
    expect(lines).toHaveLength(5);
    expect(Number(lines[4].split(',')[2])).toBeCloseTo(100, 8);
  });
});

describe('material-point CLI', () => {
  const root = resolve(__dirname, '../../../..');
  const dir = mkdtempSync(join(tmpdir(), 'mp-'));
  const write = (driver: unknown) => {
    const file = join(dir, `d${Math.random().toString(36).slice(2)}.json`);
    writeFileSync(file, typeof driver === 'string' ? driver : JSON.stringify(driver));
    return file;
  };
  const cli = (driver: unknown, out?: string) => {
    const r = materialPointCli([write(driver), ...(out ? ['--out', out] : [])]);
    return { status: r.code, stderr: r.stderr };
  };
  const good = {
    material: { model: 'souza-auricchio', E: 50000, nu: 0.3, alpha: 0, h: 1500, beta: 6, T0: 0, R: 55, eps_L: 0.05 },
    control: 'strain',
    path: [{ value: 0, temperature: 37 }, { value: 0.05, temperature: 37, increments: 50 }, { value: 0, temperature: 37, increments: 50 }],
  };

  it('writes CURVE.csv for a valid driver', () => {
    const out = join(dir, 'curve.csv');
    const r = cli(good, out);
    expect(r.status, r.stderr).toBe(0);
    const lines = readFileSync(out, 'utf8').trim().split('\n');
    expect(lines[0].split(',').slice(0, 5)).toEqual(['time', 'strain', 'stress', 'temperature', 'xi']);
    expect(lines).toHaveLength(102);
  });

  it('runs as `npm run material-point` with exit codes 0 and 2', () => {
    const out = join(dir, 'npm.csv');
    const ok = spawnSync('npm', ['run', '-s', 'material-point', '--', write(good), '--out', out], { cwd: root, encoding: 'utf8' });
    expect(ok.status, ok.stderr).toBe(0);
    expect(readFileSync(out, 'utf8').split('\n')[0].startsWith('time,strain,stress,temperature,xi')).toBe(true);
    const bad = spawnSync('npm', ['run', '-s', 'material-point', '--', write({ ...good, material: { ...good.material, model: 'x' } })], { cwd: root, encoding: 'utf8' });
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/material\.model: unknown model "x"/);
  });

  it('exits with 2 and names the field for bad drivers', () => {
    const cases: [unknown, RegExp][] = [
      [{ ...good, material: { ...good.material, model: 'mystery' } }, /material\.model: unknown model "mystery"/],
      [{ ...good, material: { ...good.material, R: undefined } }, /material\.R: R \(elastic domain radius, MPa\) is required/],
      [{ ...good, material: { ...good.material, E: 'stiff' } }, /material\.E: E \(MPa\) must be a number/],
      [{ ...good, material: { ...good.material, nu: 0.7 } }, /material\.nu: nu must be < 0\.5/],
      [{ ...good, control: 'force' }, /control/],
      [{ ...good, path: [{ value: 0, temperature: 'warm' }, { value: 1, temperature: 20 }] }, /path\[0\]\.temperature/],
      [{ ...good, material: { model: 'lagoudas2012', ...L, Af0: 12 } }, /material\.Af0/],
      ['{ not json', /cannot read/],
    ];
    for (const [driver, pattern] of cases) {
      const r = cli(driver);
      expect(r.status, `${pattern}: ${r.stderr}`).toBe(2);
      expect(r.stderr).toMatch(pattern);
    }
  });

  it('CSV of the CLI reproduces the closed-form transformation stresses of both models', () => {
    const parse = (file: string) => {
      const [head, ...lines] = readFileSync(file, 'utf8').trim().split('\n');
      const cols = head.split(',');
      return lines.map((l) => Object.fromEntries(l.split(',').map((v, i) => [cols[i], Number(v)])) as Record<string, number>);
    };
    // Lagoudas 2012, constant H, E_A = E_M, n = 1 at 50 °C: forward start C_M(T − Ms0)
    const lag = { model: 'lagoudas2012', E_A: 58000, E_M: 58000, nu: 0.3, Ms0: 15, Mf0: 0, As0: 20, Af0: 35, C_M: 6, C_A: 7.5, sigma_star: 200, H_min: 0.04, H_sat: 0.04, k_t: 0 };
    const out1 = join(dir, 'lag.csv');
    const r1 = cli({ material: lag, control: 'stress', path: [{ value: 0, temperature: 50 }, { value: 320, temperature: 50, increments: 320 }] }, out1);
    expect(r1.status, r1.stderr).toBe(0);
    const rows1 = parse(out1);
    const firstXi = rows1.find((r) => r.xi > 0)!;
    // stress control in 1 MPa steps: the first transforming row is the first stress above C_M(T − Ms0) = 210
    expect(firstXi.stress).toBeGreaterThan(210);
    expect(firstXi.stress).toBeLessThanOrEqual(211 + 1e-9);
    const done = rows1.find((r) => r.xi >= 1)!;
    expect(done.stress).toBeGreaterThanOrEqual(6 * 50);
    expect(done.stress).toBeLessThanOrEqual(6 * 50 + 1 + 1e-9);
    // Souza–Auricchio at 37 °C: forward start √(3/2)(R + β(T − T0))
    const out2 = join(dir, 'souza.csv');
    const r2 = cli({ ...good, control: 'stress', path: [{ value: 0, temperature: 37 }, { value: 400, temperature: 37, increments: 400 }] }, out2);
    expect(r2.status, r2.stderr).toBe(0);
    const start = Math.sqrt(1.5) * (55 + 6 * 37);
    const first2 = parse(out2).find((r) => r.xi > 0)!;
    expect(first2.stress).toBeGreaterThan(start);
    expect(first2.stress).toBeLessThanOrEqual(start + 1 + 1e-9);
  });
});

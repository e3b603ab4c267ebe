import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';

const BIN = new URL('../../cli/bin.mjs', import.meta.url).pathname;
const rollway = (...args: string[]) => {
  const run = spawnSync(process.execPath, [BIN, ...args], { encoding: 'utf8', timeout: 60_000 });
  return { code: run.status, stdout: run.stdout, stderr: run.stderr };
};

const CONTRACT_KEYS = ['status', 'nTotal', 'phiEnd', 'phiPivot', 'eps1', 'eps2', 'eps3', 'ns', 'r', 'nt', 'alphaS', 'amplitude', 'energyScaleGeV'];

describe('rollway point: the command-line contract of DESIGN.md', () => {
  it('prints one JSON object with the contract keys, exact spectra on request', () => {
    const out = rollway('point', '--family', 'hilltop', '--param', 'mu=15', '--param', 'q=4', '--pivot-efolds', '60', '--exact', '--json');
    expect(out.code).toBe(0);
    const result = JSON.parse(out.stdout);
    for (const key of CONTRACT_KEYS) expect(result).toHaveProperty(key);
    expect(result.status).toBe('ok');
    expect(Object.keys(result.exact).sort()).toEqual(expect.arrayContaining(['As', 'alphaS', 'amplitude', 'ns', 'r']));
    // The exact amplitude is the factor that brings P_R(k_*) for V as given to the target 2.1e-9.
    expect(result.exact.amplitude * result.exact.As).toBeCloseTo(2.1e-9, 20);
  });

  it('takes a custom expression with its parameters, and --end-phi, --phi0', () => {
    const custom = JSON.parse(rollway('point', '--expr', 'V0*(1-exp(-sqrt(2/3)*phi))^2', '--pivot-efolds', '55', '--json').stdout);
    const builtIn = JSON.parse(rollway('point', '--family', 'starobinsky', '--pivot-efolds', '55', '--json').stdout);
    expect(Math.abs(custom.ns - builtIn.ns)).toBeLessThan(1e-12);
    const powerLaw = JSON.parse(rollway('point', '--family', 'exponential', '--param', 'lambda=0.2', '--end-phi', '10', '--pivot-efolds', '55', '--json').stdout);
    expect(powerLaw.phiEnd).toBeCloseTo(10, 8);
    const short = rollway('point', '--family', 'quadratic', '--phi0', '5', '--pivot-efolds', '55', '--json');
    expect(short.code).toBe(0);
    expect(JSON.parse(short.stdout).status).toBe('too_few_efolds');
  });

  it('exits 2 with a clear message for invalid arguments', () => {
    const cases: Array<[string[], RegExp]> = [
      [['point', '--family', 'nope', '--pivot-efolds', '55'], /unknown family "nope".*quadratic/],
      [['point', '--family', 'quadratic', '--pivot-efolds', 'x'], /--pivot-efolds: "x" is not a finite number/],
      [['point', '--family', 'quadratic'], /--pivot-efolds N or as a reheating history/],
      [['point', '--pivot-efolds', '55'], /--family <id> or --expr/],
      [['point', '--family', 'exponential', '--pivot-efolds', '55'], /never ends inflation by itself; give endPhi/],
      [['point', '--family', 'hilltop', '--param', 'nu=3', '--pivot-efolds', '55'], /unknown parameter "nu".*mu, q/],
      [['point', '--family', 'quadratic', '--param', 'V0', '--pivot-efolds', '55'], /not of the form name=value/],
      [['point', '--family', 't-model', '--param', 'alpha=-1', '--pivot-efolds', '55'], /params\.alpha: must be > 0 for the "t-model" family; got -1/],
      [['point', '--expr', 'phi.constructor', '--pivot-efolds', '55'], /expression/],
      [['point', '--family', 'quadratic', '--pivot-efolds', '55', '--bogus'], /unknown option '--bogus'/],
    ];
    for (const [args, message] of cases) {
      const out = rollway(...args);
      expect(out.code, args.join(' ')).toBe(2);
      expect(out.stderr).toMatch(message);
      expect(out.stderr).not.toMatch(/\n\s+at /); // no stack trace
    }
  });
});

// `ampnote sweep` as a user runs it: JSON exactly as docs/cli.md documents it, each point equal to
// `analyze --json` of the file with the value written in, CSV with units in its header, ad-hoc sweeps, and
// usage errors.
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { cli, ensureBuilt, tempDir } from './helpers';
import { documentedPaths, matches, pathsOf } from './jsonShape';

beforeAll(() => ensureBuilt());

/** An invented buffer whose phase margin dips to about 47.6° near 59 pF of load (see the unit tests). */
const BUFFER = `design buf
  param cl = 10 pF
  param gm1 = 100 uS
  stage first  gm = gm1 rout = 2 Mohm cap = 150 fF
  stage second gm = 1 mS rout = 200 kohm cap = 200 fF inverting
  node esr
  element res second esr = 300 ohm
  element cap esr gnd = cl
  miller first -> second cc = 2 pF
  require pm >= 48 deg
  sweep cl from 1 pF to 1 nF points 5
  corner slow gm1 = 80 uS
end
`;

function withFile<T>(text: string, f: (file: string) => T): T {
  const dir = tempDir('ampnote-sweep-');
  try {
    const file = join(dir.path, 'buf.ampnote');
    writeFileSync(file, text);
    return f(file);
  } finally {
    dir.remove();
  }
}

describe('ampnote sweep', () => {
  it('prints JSON with exactly the documented fields, and every documented field occurs', () => {
    withFile(BUFFER, (file) => {
      const r = cli(['sweep', file, '--json']);
      expect(r.status).toBe(1); // the dip fails 48°
      const json = JSON.parse(r.stdout);
      expect(json.schemaVersion).toBe(1);
      expect(json.caution).toMatch(/small-signal/i);
      const documented = documentedPaths('#### Fields of `sweep --json`');
      const seen = new Set<string>();
      for (const p of pathsOf(json)) {
        expect(
          documented.some((d) => matches(d, p)),
          `${p} is not documented`,
        ).toBe(true);
        for (const d of documented) if (matches(d, p)) seen.add(d);
      }
      expect(documented.filter((d) => !seen.has(d))).toEqual([]);
      const sweep = json.designs[0].sweeps[0];
      expect(sweep.param).toBe('cl');
      expect(sweep.unit).toBe('F');
      expect(sweep.points).toHaveLength(5 * 2);
      // The worst phase margin lies between two points (the dip), below every sampled value.
      const sampled = Math.min(...sweep.points.map((p: { phaseMarginDeg: number }) => p.phaseMarginDeg));
      expect(sweep.worst.phaseMarginDeg.value).toBeLessThan(sampled);
      expect(sweep.points.map((p: { value: number }) => p.value)).not.toContain(
        sweep.worst.phaseMarginDeg.at,
      );
      expect(sweep.findings[0].message).toContain('is below the required 48.0°; fails for cl from');
    });
  });

  it('gives at each point the numbers `analyze --json` gives for the file with that value written in', () => {
    const points = withFile(BUFFER, (file) => JSON.parse(cli(['sweep', file, '--json']).stdout)).designs[0]
      .sweeps[0].points;
    const p = points[2]; // 31.6 pF, nominal
    const single = withFile(BUFFER.replace('param cl = 10 pF', `param cl = ${p.value} F`), (file) =>
      JSON.parse(cli(['analyze', file, '--json']).stdout),
    );
    const loop = single.designs[0].corners[0].loop;
    expect(p.corner).toBe('nominal');
    expect(p.phaseMarginDeg).toBe(loop.phaseMarginDeg);
    expect(p.ugfHz).toBe(loop.ugfHz);
    expect(p.gainMarginDb).toBe(loop.gainMarginDb);
  });

  it('writes CSV: one row per point and corner, units in the header, the caution last', () => {
    withFile(BUFFER, (file) => {
      const lines = cli(['sweep', file, '--csv']).stdout.trimEnd().split('\n');
      expect(lines[0]).toBe(
        'design,param,value (F),corner,phase margin (deg),ugf (Hz),gain margin (dB),loop dc gain (dB),stable',
      );
      expect(lines).toHaveLength(1 + 5 * 2 + 1);
      expect(lines[1]!.split(',').slice(0, 4)).toEqual(['buf', 'cl', '1e-12', 'nominal']);
      expect(lines.at(-1)).toMatch(/^# Small-signal/);
    });
  });

  it('runs an ad-hoc sweep of any parameter, with units on its ends', () => {
    withFile(BUFFER, (file) => {
      const r = cli([
        'sweep',
        file,
        '--param',
        'gm1',
        '--from',
        '50uS',
        '--to',
        '200 uS',
        '--points',
        '4',
        '--json',
      ]);
      const sweep = JSON.parse(r.stdout).designs[0].sweeps[0];
      expect(sweep.param).toBe('gm1');
      expect(sweep.scale).toBe('linear'); // 50 uS to 200 uS spans less than a decade
      // Linear spacing: 50, 100, 150, 200 uS (the definition of a linear grid).
      const values = [...new Set(sweep.points.map((p: { value: number }) => p.value))] as number[];
      expect(values.map((v) => Number((v * 1e6).toPrecision(12)))).toEqual([50, 100, 150, 200]);
      const text = cli(['sweep', file, '--param', 'gm1', '--from', '50uS', '--to', '200uS']).stdout;
      expect(text).toContain('gm1 from 50 uS to 200 uS, 61 points (linear)');
      expect(text).toMatch(/Small-signal/);
    });
  });

  it('is a usage error for ends of the wrong unit, a missing --to, or an unknown parameter', () => {
    withFile(BUFFER, (file) => {
      const wrongUnit = cli(['sweep', file, '--param', 'cl', '--from', '1 mA', '--to', '1 nF']);
      expect(wrongUnit.status).toBe(2);
      expect(wrongUnit.stderr).toContain('--from');
      expect(cli(['sweep', file, '--param', 'cl', '--from', '1pF']).status).toBe(2);
      const unknown = cli(['sweep', file, '--param', 'cx', '--from', '1pF', '--to', '2pF']);
      expect(unknown.status).toBe(2);
      expect(unknown.stderr).toContain('no parameter "cx"');
    });
  });

  it('is documented in --help and in the overview', () => {
    expect(cli(['sweep', '--help']).stdout).toContain('Usage: ampnote sweep FILE');
    expect(cli(['--help']).stdout).toContain('ampnote sweep FILE');
    expect(readFileSync(join(__dirname, '../../docs/cli.md'), 'utf8')).toContain('## `ampnote sweep FILE`');
  });
});

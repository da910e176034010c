// `ampnote solve` as a user runs it: the bundled example sized from bias currents fails its requirements,
// solves to `met`, `--write` changes only the free parameters' values, and `check` then exits 0.
import { copyFileSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { cli, ensureBuilt, ROOT, tempDir } from './helpers';

const EXAMPLE = join(ROOT, 'examples', 'twoStageFromBiasCurrents.ampnote');

beforeAll(() => ensureBuilt());

describe('ampnote solve', () => {
  it('solves the example from failing to met, and --write leaves every other character as written', () => {
    const dir = tempDir('ampnote-solve-');
    try {
      const file = join(dir.path, 'readout.ampnote');
      copyFileSync(EXAMPLE, file);
      expect(cli(['check', file, '--quiet']).status).toBe(1);
      const json = cli(['solve', file, '--json']);
      expect(json.status).toBe(0);
      const out = JSON.parse(json.stdout);
      expect(out.schemaVersion).toBe(1);
      expect(out.caution).toMatch(/small-signal/i);
      const design = out.designs[0];
      expect(design.status).toBe('met');
      expect(design.values.map((v: { name: string }) => v.name)).toEqual(['id1', 'id2', 'cc', 'rz']);
      for (const v of design.values) {
        expect(typeof v.before).toBe('number');
        expect(typeof v.after).toBe('number');
        expect(['low', 'high', null]).toContain(v.atBound);
      }
      expect(design.objective.after).toBeLessThanOrEqual(design.objective.before * 1.5);
      expect(design.requirements.every((r: { met: boolean }) => r.met)).toBe(true);
      const before = readFileSync(file, 'utf8');
      const write = cli(['solve', file, '--write', '--quiet']);
      expect(write.status).toBe(0);
      const after = readFileSync(file, 'utf8');
      // Only the four free values changed: every other line is as written.
      const a = before.split('\n');
      const b = after.split('\n');
      expect(b).toHaveLength(a.length);
      const changed = a.flatMap((line, i) => (line === b[i] ? [] : [i]));
      expect(changed.length).toBeLessThanOrEqual(4);
      for (const i of changed) expect(a[i]).toMatch(/^\s*param (id1|id2|cc|rz)\s+= /);
      expect(cli(['check', file, '--quiet']).status).toBe(0);
    } finally {
      dir.remove();
    }
  });

  it('exits 1 when a design is infeasible within its bounds, and names what fails', () => {
    const dir = tempDir('ampnote-solve-');
    try {
      const file = join(dir.path, 'tight.ampnote');
      const text = readFileSync(EXAMPLE, 'utf8').replace(
        'require dcgain >= 60 dB',
        'require dcgain >= 90 dB',
      );
      writeFileSync(file, text);
      const run = cli(['solve', file]);
      expect(run.status).toBe(1);
      expect(run.stdout).toMatch(/INFEASIBLE/);
      expect(run.stdout).toMatch(/open-loop DC gain/);
      expect(run.stdout).toMatch(/small-signal/i);
    } finally {
      dir.remove();
    }
  });

  it('is a usage error without a file', () => {
    expect(cli(['solve']).status).toBe(2);
  });
});

// The checker at the edges of its use in CI: no command, an output path that names the config file,
// inputs too large to analyse in memory, and the small-signal caution in every format `check` writes.
import { readFileSync, writeFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { CAUTION } from '../../shared/src/protocol/panelData';
import { cli, ensureBuilt, FIXTURES, ROOT, tempDir } from './helpers';

const rel = (name: string) => relative(ROOT, join(FIXTURES, name));
const oneSpaced = (s: string) => s.replace(/\s+/g, ' ').trim();

beforeAll(() => ensureBuilt(), 300_000);

describe('usage', () => {
  it('is an error without any argument: usage on standard error, status 2', () => {
    const r = cli([]);
    expect(r.status).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(/^ampnote — checks amplifier design-intent files/);
    expect(r.stderr).toContain('Usage:');
  });

  it('gives the whole caution in the help of the program and of check', () => {
    for (const args of [['--help'], ['check', '--help']]) {
      const r = cli(args);
      expect(r.status).toBe(0);
      expect(oneSpaced(r.stdout)).toContain(CAUTION);
    }
  });
});

describe('output file', () => {
  it.each([
    ['check', (input: string, config: string) => ['check', input, '--config', config, '-o', config]],
    ['analyze', (input: string, config: string) => ['analyze', input, '-c', config, '--output', config]],
    ['report', (input: string, config: string) => ['report', input, '--config', config, '-o', config]],
  ])('%s refuses to overwrite the --config file', (_, args) => {
    const dir = tempDir('config-out');
    try {
      const config = join(dir.path, 'thresholds.json');
      const written = '{ "ampnote.checks": { "phaseMargin": 45 } }\n';
      writeFileSync(config, written);
      const r = cli(args(join(ROOT, rel('clean.ampnote')), config));
      expect(r.status).toBe(2);
      expect(r.stderr).toContain('it is the --config file');
      expect(readFileSync(config, 'utf8')).toBe(written);
    } finally {
      dir.remove();
    }
  });
});

describe('size limit', () => {
  it('refuses a 50 MB input with its size and status 2, and still checks the others', () => {
    const dir = tempDir('huge');
    try {
      const huge = join(dir.path, 'huge.ampnote');
      const design = readFileSync(join(FIXTURES, 'clean.ampnote'), 'utf8');
      writeFileSync(huge, design.repeat(Math.ceil((50 * 1024 * 1024) / design.length)));
      const r = cli(['check', huge, rel('clean.ampnote'), '--format', 'json']);
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(
        /huge\.ampnote: error: the file is 50 MB, larger than the 1 MB an input may have; split it into smaller files/,
      );
      const json = JSON.parse(r.stdout) as {
        files: { path: string }[];
        problems: { path: string; message: string }[];
      };
      expect(json.files.map((f) => f.path)).toEqual([rel('clean.ampnote')]);
      expect(json.problems).toHaveLength(1);
      expect(json.problems[0]!.message).toContain('larger than the 1 MB');
      const analyze = cli(['analyze', huge]);
      expect(analyze.status).toBe(2);
      expect(analyze.stderr).toContain('larger than the 1 MB');
    } finally {
      dir.remove();
    }
  });

  it('reads a file just under the limit', () => {
    const dir = tempDir('under');
    try {
      const file = join(dir.path, 'padded.ampnote');
      const design = readFileSync(join(FIXTURES, 'clean.ampnote'), 'utf8');
      // One design and comment lines up to just below 1 MB: the limit is on bytes, not on designs.
      const comment = `# ${'x'.repeat(98)}\n`;
      const room = 1024 * 1024 - Buffer.byteLength(design);
      writeFileSync(file, design + comment.repeat(Math.floor(room / comment.length)));
      const r = cli(['check', file, '--quiet']);
      expect(r.stderr).not.toContain('larger than');
      expect(r.status).not.toBe(2);
    } finally {
      dir.remove();
    }
  });
});

describe('small-signal caution in check', () => {
  it('follows the text summary', () => {
    const r = cli(['check', rel('clean.ampnote')]);
    expect(r.stdout).toMatch(/^1 file, 1 design, .*\nNote: Small-signal/m);
    expect(oneSpaced(r.stdout)).toContain(`Note: ${CAUTION}`);
    expect(cli(['check', rel('clean.ampnote'), '--quiet']).stdout).not.toContain('Small-signal');
  });

  it('is a field of the JSON and a property of the SARIF run', () => {
    const json = JSON.parse(cli(['check', rel('clean.ampnote'), '--format', 'json']).stdout) as {
      caution: string;
    };
    expect(json.caution).toBe(CAUTION);
    const sarif = JSON.parse(cli(['check', rel('clean.ampnote'), '--format', 'sarif']).stdout) as {
      runs: { properties?: { caution?: string } }[];
    };
    expect(sarif.runs[0]!.properties?.caution).toBe(CAUTION);
  });
});

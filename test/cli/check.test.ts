// `ampnote check`: the built program in a child process — exit codes, compiler-style lines, JSON and SARIF.
import Ajv from 'ajv';
import addFormats from 'ajv-formats';
import { spawnSync } from 'node:child_process';
import { mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import type * as Sarif from 'sarif';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CHECK_CODES, type Finding } from '../../shared/src/checks/types';
import { analyzeDocument } from '../../shared/src/service';
import { cli, ensureBuilt, FIXTURES, ROOT, tempDir } from './helpers';
import { documentedPaths, matches, pathsOf, splitFindings } from './jsonShape';

const rel = (name: string) => relative(ROOT, join(FIXTURES, name));
const text = (name: string) => readFileSync(join(FIXTURES, name), 'utf8');
/** The compiler-style line of one finding, built here from the engine's own result. */
const line = (path: string, f: Finding) =>
  `${path}:${f.range.start.line + 1}:${f.range.start.character + 1}: ${f.severity} ${f.code}: ${f.message}` +
  (f.corners && f.corners.length > 0 ? ` [${f.corners.join(', ')}]` : '');
const byPosition = (a: Finding, b: Finding) =>
  a.range.start.line - b.range.start.line || a.range.start.character - b.range.start.character;

beforeAll(() => ensureBuilt(), 300_000);

describe('exit status', () => {
  it('is 0 for a design without error-level findings, with the summary line', () => {
    const r = cli(['check', rel('clean.ampnote')]);
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    // The summary, then the small-signal caution (docs/cli.md, text format).
    expect(r.stdout).toMatch(/^1 file, 1 design, 0 errors, 0 warnings\nNote: Small-signal[^]*practice\.\n$/);
  });

  it('is 1 when a finding is an error', () => {
    const r = cli(['check', rel('marginal.ampnote')]);
    expect(r.status).toBe(1);
    expect(r.stdout).toMatch(/^1 file, 1 design, [1-9]\d* errors?, \d+ warnings?$/m);
  });

  it('is 2 for an unreadable input, and the other files are still checked', () => {
    const r = cli(['check', 'no/such/file.ampnote', rel('marginal.ampnote')]);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('no/such/file.ampnote: error: no such file or folder');
    expect(r.stdout).toContain(`${rel('marginal.ampnote')}:`);
    expect(r.stdout).toMatch(/^1 file, 1 design, .*, 1 unreadable input$/m);
  });

  it('is 2 for a folder without design files, naming it', () => {
    const dir = tempDir('empty');
    try {
      writeFileSync(join(dir.path, 'notes.txt'), 'not a design');
      const r = cli(['check', '.'], dir.path);
      expect(r.status).toBe(2);
      expect(r.stderr).toContain('.: error: folder holds no .ampnote files');
    } finally {
      dir.remove();
    }
  });

  it('is 2 for bad usage, with a hint', () => {
    for (const args of [
      ['check'],
      ['check', 'x', '--format', 'xml'],
      ['lint', 'x'],
      ['check', 'x', '--nope'],
    ]) {
      const r = cli(args);
      expect(r.status, args.join(' ')).toBe(2);
      expect(r.stderr).toMatch(/^ampnote: .+\nRun 'ampnote (check )?--help' for usage\.\n$/);
      expect(r.stdout).toBe('');
    }
  });

  it('prints help and the version with status 0', () => {
    const help = cli(['--help']);
    expect(help.status).toBe(0);
    expect(help.stdout).toContain('ampnote check FILE|FOLDER...');
    const version = cli(['--version']);
    expect(version.status).toBe(0);
    expect(version.stdout).toBe(JSON.parse(readFileSync(join(ROOT, 'package.json'), 'utf8')).version + '\n');
  });
});

describe('text output', () => {
  it('prints one line per finding, exactly as the engine found them, in reading order', () => {
    const name = 'marginal.ampnote';
    const expected = analyzeDocument(text(name)).findings.slice().sort(byPosition);
    expect(expected.length).toBeGreaterThan(0);
    const r = cli(['check', rel(name)]);
    const findingLines = r.stdout.split('\n').filter((l) => /^\S+:\d+:\d+: /.test(l));
    expect(findingLines).toEqual(expected.map((f) => line(rel(name), f)));
  });

  it('puts the right-half-plane zero on the Miller statement at gm2/(2π·Cc)', () => {
    // z = gm2/Cc for a Miller capacitor without nulling resistor (GHLM ch. 9, AH ch. 6; from memory,
    // re-derived): 480 uS / (2π · 0.8 pF) = 95.49 MHz, shown to three digits.
    const r = cli(['check', rel('marginal.ampnote')]);
    expect(r.stdout).toMatch(
      new RegExp(`^${rel('marginal.ampnote')}:12:3: error rhp-zero: .*95\\.5 MHz`, 'm'),
    );
  });

  it('reports a syntax error at its place and still checks the rest of the file', () => {
    const r = cli(['check', rel('broken.ampnote')]);
    expect(r.status).toBe(1);
    expect(r.stdout).toMatch(new RegExp(`^${rel('broken.ampnote')}:4:\\d+: error syntax: `, 'm'));
    expect(r.stdout).toMatch(/^1 file, 2 designs, /m);
  });

  it('says which design the design rules skipped because of its language errors, and that it was not checked', () => {
    // broken.ampnote: design half_written (line 2, name at column 8) has a syntax error; intact has none.
    const r = cli(['check', rel('broken.ampnote')]);
    const notes = r.stdout.split('\n').filter((l) => / note: design \S+ was not checked/.test(l));
    expect(notes).toEqual([
      `${rel('broken.ampnote')}:2:8: note: design half_written was not checked by the design rules: it has language errors; fix them first`,
    ]);
    expect(r.stdout).toMatch(/^1 file, 2 designs, 1 error, 0 warnings, 1 design not checked$/m);
    // A clean file says nothing of the kind.
    expect(cli(['check', rel('clean.ampnote')]).stdout).not.toMatch(/not checked/);
  });

  it('finds *.ampnote files in folders, skipping node_modules and dot-folders', () => {
    const dir = tempDir('tree');
    try {
      const design = text('clean.ampnote');
      for (const p of [
        'a.ampnote',
        'sub/deeper/b.ampnote',
        'node_modules/pkg/c.ampnote',
        '.cache/d.ampnote',
        'sub/e.txt',
      ]) {
        mkdirSync(join(dir.path, p, '..'), { recursive: true });
        writeFileSync(join(dir.path, p), design);
      }
      writeFileSync(join(dir.path, 'sub', 'bad.ampnote'), text('marginal.ampnote'));
      const r = cli(['check', '.', '--format', 'json'], dir.path);
      expect(r.status).toBe(1);
      const json = JSON.parse(r.stdout);
      expect(json.files.map((f: { path: string }) => f.path)).toEqual([
        'a.ampnote',
        join('sub', 'bad.ampnote'),
        join('sub', 'deeper', 'b.ampnote'),
      ]);
    } finally {
      dir.remove();
    }
  });

  it('applies thresholds from --config, and refuses a config file it cannot read', () => {
    const dir = tempDir('config');
    try {
      const name = 'clean.ampnote';
      const strict = { nondominantFactor: 50 };
      writeFileSync(join(dir.path, 'settings.json'), JSON.stringify({ 'ampnote.checks': strict }));
      const expected = analyzeDocument(text(name), strict).findings;
      expect(expected.some((f) => f.code === 'nondominant-pole')).toBe(true);
      expect(analyzeDocument(text(name)).findings.some((f) => f.code === 'nondominant-pole')).toBe(false);
      const r = cli([
        'check',
        join(FIXTURES, name),
        '--config',
        join(dir.path, 'settings.json'),
        '--format',
        'json',
      ]);
      expect(r.stderr).not.toContain('settings.json: warning');
      const got = JSON.parse(r.stdout).files[0].findings.map((f: { code: string; message: string }) => [
        f.code,
        f.message,
      ]);
      expect(got).toEqual(
        expected
          .slice()
          .sort(byPosition)
          .map((f) => [f.code, f.message]),
      );

      writeFileSync(join(dir.path, 'bad.json'), '{ "phaseMargin": ');
      const bad = cli(['check', join(FIXTURES, name), '--config', join(dir.path, 'bad.json')]);
      expect(bad.status).toBe(2);
      expect(bad.stderr).toContain('bad.json: error: not valid JSON');
      expect(bad.stdout).toBe('');
    } finally {
      dir.remove();
    }
  });

  it('draws a progress line on a terminal for many files, never in a pipe or with --quiet', () => {
    const dir = tempDir('tty');
    try {
      for (let i = 1; i <= 6; i++) writeFileSync(join(dir.path, `d${i}.ampnote`), text('clean.ampnote'));
      // `script` runs the checker on a pseudo-terminal, as a person at a terminal would.
      const onTerminal = (extra: string) =>
        spawnSync(
          'script',
          ['-qec', `"${process.execPath}" "${join(ROOT, 'dist', 'cli.js')}" check .${extra}`, '/dev/null'],
          {
            cwd: dir.path,
            encoding: 'utf8',
            timeout: 120_000,
          },
        ).stdout;
      const shown = onTerminal('');
      expect(shown).toContain('\r\x1b[K[1/6] checking d1.ampnote');
      expect(shown).toContain('\r\x1b[K[6/6] checking d6.ampnote');
      // Erased before the summary is printed.
      expect(shown).toMatch(
        /\r\x1b\[K6 files, 6 designs, 0 errors, 0 warnings\r?\nNote: Small-signal[^\x1b]*$/,
      );
      expect(onTerminal(' --quiet')).toBe('');
      const piped = cli(['check', '.'], dir.path);
      expect(piped.stderr).toBe('');
      expect(piped.stdout).toMatch(
        /^6 files, 6 designs, 0 errors, 0 warnings\nNote: Small-signal[^\r\x1b]*$/,
      );
    } finally {
      dir.remove();
    }
  });

  it('--quiet leaves only the findings', () => {
    const r = cli(['check', rel('clean.ampnote'), '--quiet']);
    expect(r.status).toBe(0);
    expect(r.stdout).toBe('');
    expect(r.stderr).toBe('');
  });

  it('writes nothing but the requested output file', () => {
    const dir = tempDir('out');
    try {
      const r = cli(
        ['check', join(FIXTURES, 'marginal.ampnote'), '--format', 'sarif', '-o', 'out.sarif'],
        dir.path,
      );
      expect(r.status).toBe(1);
      expect(r.stdout).toBe('');
      expect(readdirSync(dir.path)).toEqual(['out.sarif']);
      expect(JSON.parse(readFileSync(join(dir.path, 'out.sarif'), 'utf8')).version).toBe('2.1.0');
      const none = cli(['check', join(FIXTURES, 'marginal.ampnote')], dir.path);
      expect(none.status).toBe(1);
      expect(readdirSync(dir.path)).toEqual(['out.sarif']);
      // An output path naming an input is refused, and the design file is left as it was.
      writeFileSync(join(dir.path, 'mine.ampnote'), text('marginal.ampnote'));
      const clash = cli(['check', '.', '--format', 'json', '-o', 'mine.ampnote'], dir.path);
      expect(clash.status).toBe(2);
      expect(clash.stderr).toContain('refusing to write mine.ampnote: it is one of the inputs');
      expect(readFileSync(join(dir.path, 'mine.ampnote'), 'utf8')).toBe(text('marginal.ampnote'));
      expect(readdirSync(dir.path).sort()).toEqual(['mine.ampnote', 'out.sarif']);
    } finally {
      dir.remove();
    }
  });
});

describe('--format json', () => {
  const files = ['clean.ampnote', 'marginal.ampnote', 'broken.ampnote'];
  let json: any;
  beforeAll(() => {
    const r = cli(['check', ...files.map(rel), '--format', 'json']);
    expect(r.status).toBe(1);
    json = JSON.parse(r.stdout);
  });

  it('has the documented top-level shape', () => {
    expect(Object.keys(json).sort()).toEqual([
      'caution',
      'exitCode',
      'files',
      'problems',
      'schemaVersion',
      'summary',
      'tool',
    ]);
    expect(json.schemaVersion).toBe(1);
    expect(json.tool).toEqual({ name: 'ampnote', version: expect.any(String) });
    expect(json.exitCode).toBe(1);
    expect(json.problems).toEqual([]);
    expect(Object.keys(json.summary).sort()).toEqual([
      'designs',
      'errors',
      'files',
      'infos',
      'notChecked',
      'unreadable',
      'warnings',
    ]);
  });

  it('has exactly the fields docs/cli.md documents, and every documented field occurs', () => {
    const missing = cli(['check', rel('marginal.ampnote'), 'gone.ampnote', '--format', 'json']);
    const top = documentedPaths('#### Fields of `check --format json`');
    const finding = documentedPaths('A _finding_');
    const seen = new Set<string>();
    const seenFinding = new Set<string>();
    for (const value of [json, JSON.parse(missing.stdout)]) {
      const { own, finding: inFindings } = splitFindings(pathsOf(value), ['files[].findings[]']);
      for (const p of own) {
        expect(
          top.some((d) => matches(d, p)),
          `${p} is not documented`,
        ).toBe(true);
        for (const d of top) if (matches(d, p)) seen.add(d);
      }
      for (const p of inFindings) {
        expect(
          finding.some((d) => matches(d, p)),
          `finding field ${p} is not documented`,
        ).toBe(true);
        for (const d of finding) if (matches(d, p)) seenFinding.add(d);
      }
    }
    expect(top.filter((d) => !seen.has(d))).toEqual([]);
    expect(finding.filter((d) => !seenFinding.has(d))).toEqual([]);
  });

  it('lists each finding as the engine reports it, with both zero- and one-based places', () => {
    let errors = 0;
    let warnings = 0;
    files.forEach((name, i) => {
      const report = analyzeDocument(text(name));
      const entry = json.files[i];
      expect(entry.path).toBe(rel(name));
      expect(entry.designs).toEqual(report.designs.map((d) => d.source.name));
      const expected = report.findings.slice().sort(byPosition);
      expect(entry.findings).toHaveLength(expected.length);
      entry.findings.forEach((f: any, k: number) => {
        const e = expected[k]!;
        expect(Object.keys(f).sort()).toEqual(
          [
            'code',
            'corners',
            'design',
            'fixes',
            'location',
            'message',
            'range',
            'related',
            'severity',
          ].sort(),
        );
        expect([f.code, f.severity, f.message, f.design]).toEqual([
          e.code,
          e.severity,
          e.message,
          e.design ?? null,
        ]);
        expect(f.range).toEqual(e.range);
        expect(f.location).toEqual({
          line: e.range.start.line + 1,
          column: e.range.start.character + 1,
          endLine: e.range.end.line + 1,
          endColumn: e.range.end.character + 1,
        });
        expect(f.related.map((x: any) => [x.range, x.message])).toEqual(
          e.related.map((x) => [x.range, x.message]),
        );
        expect(
          f.fixes.map((x: any) => [x.title, x.preferred, x.edits.map((d: any) => [d.range, d.newText])]),
        ).toEqual(
          e.fixes.map((x) => [x.title, x.preferred === true, x.edits.map((d) => [d.range, d.newText])]),
        );
        if (e.severity === 'error') errors++;
        if (e.severity === 'warning') warnings++;
      });
    });
    expect(json.summary).toMatchObject({ files: 3, designs: 4, errors, warnings, unreadable: 0 });
  });

  it('lists the designs the design rules skipped, at their names, and counts them', () => {
    const broken = json.files.find((f: any) => f.path.endsWith('broken.ampnote'));
    expect(broken.notChecked).toEqual([
      {
        design: 'half_written',
        reason: 'language-errors',
        message:
          'design half_written was not checked by the design rules: it has language errors; fix them first',
        range: { start: { line: 1, character: 7 }, end: { line: 1, character: 19 } },
        location: { line: 2, column: 8, endLine: 2, endColumn: 20 },
      },
    ]);
    for (const f of json.files) if (f !== broken) expect(f.notChecked).toEqual([]);
    expect(json.summary.notChecked).toBe(1);
  });
});

describe('--format sarif', () => {
  const schema = JSON.parse(
    readFileSync(join(ROOT, 'test', 'cli', 'vendor', 'sarif-schema-2.1.0.json'), 'utf8'),
  );
  const files = ['clean.ampnote', 'marginal.ampnote', 'broken.ampnote'];
  let log: Sarif.Log;
  let dir: ReturnType<typeof tempDir>;
  afterAll(() => dir?.remove());
  beforeAll(() => {
    dir = tempDir('sarif');
    const r = cli(
      ['check', ...files.map((f) => join(FIXTURES, f)), 'missing.ampnote', '--format', 'sarif'],
      dir.path,
    );
    expect(r.status).toBe(2);
    log = JSON.parse(r.stdout);
  });

  it('validates against the SARIF 2.1.0 schema (JSON Schema draft-07)', () => {
    expect(schema.$schema).toBe('http://json-schema.org/draft-07/schema#');
    const ajv = new Ajv({ allErrors: true, strict: false });
    addFormats(ajv);
    const validate = ajv.compile(schema);
    const ok = validate(log);
    expect(validate.errors ?? []).toEqual([]);
    expect(ok).toBe(true);
    // The validator does reject a log that breaks the schema.
    expect(
      validate({
        ...log,
        runs: [{ ...log.runs[0], results: [{ message: { text: 'x' }, level: 'severe' }] }],
      }),
    ).toBe(false);
  });

  it('describes every finding code as a rule with help', () => {
    const rules = log.runs[0]!.tool.driver.rules!;
    expect(rules.map((r) => r.id)).toEqual([...CHECK_CODES]);
    for (const r of rules) {
      expect(r.help?.text).toBeTruthy();
      expect(r.helpUri).toMatch(new RegExp(`^file://.*/docs/checks\\.md#${r.id}$`));
    }
  });

  it('carries each finding with its rule, level, 1-based region, related places and fixes', () => {
    const run = log.runs[0]!;
    const expected = files.flatMap((name) =>
      analyzeDocument(text(name))
        .findings.slice()
        .sort(byPosition)
        .map((f) => ({ name, f })),
    );
    expect(run.results).toHaveLength(expected.length);
    const levels = { error: 'error', warning: 'warning', info: 'note' } as const;
    run.results!.forEach((res, i) => {
      const { name, f } = expected[i]!;
      expect(res.ruleId).toBe(f.code);
      expect(run.tool.driver.rules![res.ruleIndex!]!.id).toBe(f.code);
      expect(res.level).toBe(levels[f.severity]);
      expect(res.message.text).toBe(f.message);
      const loc = res.locations![0]!.physicalLocation!;
      // The fixtures lie outside the working folder, so they are named by absolute URI, not against SRCROOT.
      expect(loc.artifactLocation).toMatchObject({
        uri: 'file://' + join(FIXTURES, name),
        index: files.indexOf(name),
      });
      expect(loc.region).toEqual({
        startLine: f.range.start.line + 1,
        startColumn: f.range.start.character + 1,
        endLine: f.range.end.line + 1,
        endColumn: f.range.end.character + 1,
      });
      expect((res.relatedLocations ?? []).map((x) => x.message?.text)).toEqual(
        f.related.map((x) => x.message),
      );
      // A disabled fix (no value meets the rule) has no edit to carry: SARIF lists only offered ones.
      const offered = f.fixes.filter((x) => x.disabled === undefined);
      expect((res.fixes ?? []).map((x) => x.description?.text)).toEqual(offered.map((x) => x.title));
      for (const [k, fix] of (res.fixes ?? []).entries()) {
        const edits = offered[k]!.edits;
        expect(
          fix.artifactChanges[0]!.replacements.map((x) => [
            x.deletedRegion.startLine,
            x.insertedContent?.text,
          ]),
        ).toEqual(edits.map((e) => [e.range.start.line + 1, e.newText]));
      }
    });
    expect(run.results!.some((r) => (r.fixes ?? []).length > 0)).toBe(true);
    expect(run.results!.some((r) => (r.relatedLocations ?? []).length > 0)).toBe(true);
  });

  it('names files under the working folder relative to SRCROOT', () => {
    const r = cli(['check', rel('marginal.ampnote'), '--format', 'sarif', '--quiet']);
    const run = (JSON.parse(r.stdout) as Sarif.Log).runs[0]!;
    expect(run.originalUriBaseIds).toEqual({ SRCROOT: { uri: `file://${ROOT}/` } });
    expect(run.results![0]!.locations![0]!.physicalLocation!.artifactLocation).toEqual({
      uri: 'test/cli/fixtures/marginal.ampnote',
      uriBaseId: 'SRCROOT',
      index: 0,
    });
    expect(run.invocations![0]).toMatchObject({ executionSuccessful: true, exitCode: 1 });
  });

  it('points at files by URI and reports the unreadable one as a failed execution', () => {
    const run = log.runs[0]!;
    expect(run.columnKind).toBe('utf16CodeUnits');
    expect(run.artifacts!.map((a) => a.location!.uri)).toEqual(
      files.map((f) => 'file://' + join(FIXTURES, f)),
    );
    const inv = run.invocations![0]!;
    expect(inv.executionSuccessful).toBe(false);
    expect(inv.exitCode).toBe(2);
    expect(inv.toolExecutionNotifications!.map((n) => n.message.text)).toEqual([
      'missing.ampnote: no such file or folder',
    ]);
  });
});

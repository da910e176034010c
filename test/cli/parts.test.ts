// The CLI's pure parts on their own: argument parsing, the config file, the progress line, HTML escaping.
import { describe, expect, it } from 'vitest';
import { parseArgs } from '../../cli/src/args';
import { parseConfig, stripJsonComments } from '../../cli/src/config';
import { createProgress } from '../../cli/src/progress';
import { embedJson, escapeHtml, inlineScript } from '../../cli/src/htmlReport';
import { DEFAULT_CHECK_SETTINGS } from '../../shared/src/checks/settings';

describe('parseArgs', () => {
  it('reads check with folders, format and quiet in any order', () => {
    const r = parseArgs(['check', 'a', '--format=sarif', 'b', '-q', '--config', 'c.json']);
    expect(r).toEqual({
      ok: true,
      command: {
        kind: 'check',
        paths: ['a', 'b'],
        format: 'sarif',
        quiet: true,
        config: 'c.json',
        output: undefined,
      },
    });
  });

  it('rejects an unknown format, an unknown option and a missing value', () => {
    expect(parseArgs(['check', 'x', '--format', 'xml'])).toMatchObject({
      ok: false,
      error: expect.stringContaining("'xml'"),
    });
    expect(parseArgs(['check', 'x', '--fast'])).toMatchObject({
      ok: false,
      error: expect.stringContaining('--fast'),
    });
    expect(parseArgs(['analyze', 'x', '--design'])).toMatchObject({
      ok: false,
      error: expect.stringContaining('needs a value'),
    });
    expect(parseArgs(['check'])).toMatchObject({ ok: false });
    expect(parseArgs(['report', 'x.ampnote'])).toMatchObject({
      ok: false,
      error: expect.stringContaining('-o'),
    });
    expect(parseArgs(['lint', 'x'])).toMatchObject({ ok: false, error: expect.stringContaining("'lint'") });
  });

  it('takes everything after -- as a path, even when it looks like an option', () => {
    expect(parseArgs(['check', '--', '--odd-name.ampnote'])).toMatchObject({
      ok: true,
      command: { paths: ['--odd-name.ampnote'] },
    });
  });

  it('reads help and version in their usual spellings', () => {
    expect(parseArgs([])).toEqual({ ok: true, command: { kind: 'help' } });
    expect(parseArgs(['--version'])).toEqual({ ok: true, command: { kind: 'version' } });
    expect(parseArgs(['-V'])).toEqual({ ok: true, command: { kind: 'version' } });
    expect(parseArgs(['analyze', '--help'])).toEqual({
      ok: true,
      command: { kind: 'help', topic: 'analyze' },
    });
    expect(parseArgs(['help', 'report'])).toEqual({ ok: true, command: { kind: 'help', topic: 'report' } });
  });

  it('reads analyze and report with their own options', () => {
    expect(parseArgs(['analyze', 'f.ampnote', '-d', 'amp', '--json'])).toMatchObject({
      ok: true,
      command: { kind: 'analyze', file: 'f.ampnote', design: 'amp', json: true },
    });
    expect(parseArgs(['report', 'f.ampnote', '-o', 'r.html'])).toMatchObject({
      ok: true,
      command: { kind: 'report', file: 'f.ampnote', output: 'r.html' },
    });
    expect(parseArgs(['analyze', 'a', 'b'])).toMatchObject({ ok: false });
  });
});

describe('parseConfig', () => {
  it('accepts the flat, nested and settings-file spellings', () => {
    const flat = parseConfig('{"phaseMargin": 45}');
    const nested = parseConfig('{"ampnote": {"checks": {"phaseMargin": 45}}}');
    const dotted = parseConfig('{"ampnote.checks": {"phaseMargin": 45}}');
    const settingsFile = parseConfig(
      '{\n  // editor settings\n  "editor.tabSize": 2,\n  "ampnote.checks.phaseMargin": 45, /* ours */\n}',
    );
    for (const r of [flat, nested, dotted, settingsFile]) {
      expect(r).toMatchObject({ ok: true, warnings: [] });
      if (r.ok) expect(r.settings).toEqual({ ...DEFAULT_CHECK_SETTINGS, phaseMargin: 45 });
    }
  });

  it('warns about unknown keys and bad values, keeping the defaults for them', () => {
    const r = parseConfig('{"phaseMargn": 45, "gainMargin": -3}');
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.settings).toEqual(DEFAULT_CHECK_SETTINGS);
    expect(r.warnings).toHaveLength(2);
    expect(r.warnings[0]).toContain('phaseMargn');
    expect(r.warnings[1]).toContain('gainMargin');
  });

  it('refuses text that is not a JSON object', () => {
    expect(parseConfig('{"phaseMargin": }')).toMatchObject({
      ok: false,
      error: expect.stringContaining('not valid JSON'),
    });
    expect(parseConfig('[1, 2]')).toMatchObject({ ok: false });
  });

  it('leaves comment-like text inside strings alone', () => {
    expect(JSON.parse(stripJsonComments('{"a": "x // y /* z */", "b": [1, 2,],}'))).toEqual({
      a: 'x // y /* z */',
      b: [1, 2],
    });
  });
});

describe('createProgress', () => {
  const sink = (isTTY: boolean) => {
    const writes: string[] = [];
    return { writes, stream: { isTTY, columns: 40, write: (s: string) => writes.push(s) } };
  };

  it('stays silent off a terminal, when quiet, and for a short run of few files', () => {
    for (const [tty, enabled, total] of [
      [false, true, 50],
      [true, false, 50],
      [true, true, 2],
    ] as const) {
      const s = sink(tty);
      const p = createProgress(s.stream, enabled, () => 0);
      for (let i = 0; i < total; i++) p.step(i, total, `f${i}`);
      p.done();
      expect(s.writes).toEqual([]);
    }
  });

  it('draws one overwritten line for many files and erases it at the end', () => {
    const s = sink(true);
    let t = 0;
    const p = createProgress(s.stream, true, () => (t += 100));
    for (let i = 0; i < 5; i++) p.step(i, 5, `checking file${i}.ampnote`);
    p.done();
    expect(s.writes[0]).toBe('\r\x1b[K[1/5] checking file0.ampnote');
    expect(s.writes.at(-2)).toBe('\r\x1b[K[5/5] checking file4.ampnote');
    expect(s.writes.at(-1)).toBe('\r\x1b[K');
  });

  it('appears for a few files once the run has taken more than a second', () => {
    const s = sink(true);
    const times = [0, 10, 1500];
    const p = createProgress(s.stream, true, () => times.shift() ?? 2000);
    p.step(0, 2, 'a');
    p.step(1, 2, 'b');
    expect(s.writes).toEqual(['\r\x1b[K[2/2] b']);
  });
});

describe('HTML escaping', () => {
  it('escapes markup in user text and keeps embedded JSON and scripts from closing their element', () => {
    expect(escapeHtml(`<b a="1">'&'</b>`)).toBe('&lt;b a=&quot;1&quot;&gt;&#39;&amp;&#39;&lt;/b&gt;');
    const embedded = embedJson({ name: '</script><script>alert(1)</script>' });
    expect(embedded).not.toContain('<');
    expect(JSON.parse(embedded)).toEqual({ name: '</script><script>alert(1)</script>' });
    const code = inlineScript('var s = "</script>" + "<!--";\n//# sourceMappingURL=charts.js.map\n');
    expect(code).not.toMatch(/<\/script|<!--|sourceMappingURL/i);
    expect(new Function(`${code}; return s;`)()).toBe('</script><!--');
  });
});

// Hover and inline values of a loop written as a circuit: the real loop on `feedback at`, each supply's
// rejection on `supply`. Expected numbers come from the engine's own analysis, computed independently of
// the feature under test, and one from a hand closed form.
import { describe, expect, it } from 'vitest';
import { TextDocument } from 'vscode-languageserver-textdocument';
import { analyzeDocument, createAnalysisCache } from '../../shared/src/service';
import { hover } from '../../server/src/features/hover';
import { inlayHints } from '../../server/src/features/inlayHints';
import { formatDb } from '../../shared/src/format/si';

// An invented regulator: error amplifier, pass device from the supply, divider, output capacitor.
const TEXT = `design reg
  supply vdd
  node fb
  stage ea from fb, in gm = 100 uS rout = 1 Mohm cap = 5 pF
  element gm vdd, ea -> out = 50 mS
  element res vdd out = 20 kohm
  element res out fb = 100 kohm
  element res fb gnd = 100 kohm
  element cap out gnd = 1 uF
  load res = 1 kohm
  output out
  feedback at fb
end
`;

const lines = TEXT.split('\n');
const lineOf = (start: string) => lines.findIndex((l) => l.trimStart().startsWith(start));
const at = (start: string, offset: number) => ({
  line: lineOf(start),
  character: lines[lineOf(start)]!.indexOf(start) + offset,
});

describe('a loop written as a circuit in the editor', () => {
  const report = analyzeDocument(TEXT);
  const a = report.designs[0]!.runs[0]!.analysis;
  const hoverAt = (p: { line: number; character: number }) =>
    (hover(report, p)!.contents as { value: string }).value;

  it('the loop gain at DC is gm_ea·rout_ea · divider · gm_p·(r_o ∥ r_L ∥ (r1 + r2)) (hand closed form)', () => {
    const ro = 1 / (1 / 20e3 + 1 / 1e3 + 1 / 200e3);
    const t0 = 100e-6 * 1e6 * 0.5 * 50e-3 * ro;
    expect(Math.abs(a.dcGain - t0) / t0).toBeLessThan(1e-9);
  });

  it('hover on `feedback at` shows the real loop and the closed circuit', () => {
    const value = hoverAt(at('feedback at', 2));
    expect(value).toContain('**feedback at fb**');
    expect(value).toMatch(/Loop: loop gain .* at DC · UGF .* · PM .*°/);
    expect(value).toContain('Output impedance:');
    expect(value).toContain('Supply vdd: rejection');
  });

  it('hover on a supply shows its rejection at DC and its worst frequency', () => {
    const value = hoverAt(at('supply vdd', 'supply '.length + 1));
    const s = a.closedCircuit!.supplies[0]!;
    expect(value).toContain('**supply vdd**');
    expect(value).toContain(`rejection ${formatDb(s.dcDb)} at DC`);
    expect(value).toContain(`worst ${formatDb(s.worstDb)}`);
  });

  it('inline values after `feedback at` and after `supply`', () => {
    const document = TextDocument.create('file:///r.ampnote', 'ampnote', 1, TEXT);
    const hints = inlayHints(report, document, {
      start: { line: 0, character: 0 },
      end: { line: 99, character: 0 },
    });
    const byLine = new Map(hints.map((h) => [h.position.line, String(h.label)]));
    expect(byLine.get(lineOf('feedback at'))).toMatch(/loop gain .* at DC · UGF .* · PM /);
    expect(byLine.get(lineOf('supply vdd'))).toContain('vdd: rejection');
  });
});

describe('the editor, which computes time responses only where a requirement reads one', () => {
  it('judges a `loadstep` requirement as the terminal checker does', () => {
    const text = TEXT.replace(
      '  feedback at fb\n',
      '  feedback at fb\n  require loadstep <= 1 uV for 1 mA\n',
    );
    const editor = analyzeDocument(
      text,
      {},
      undefined,
      createAnalysisCache({ stepResponse: 'when-required' }),
    );
    const terminal = analyzeDocument(text);
    const codes = (r: typeof editor) =>
      r.designs[0]!.findings.filter((f) => f.code === 'load-step').map((f) => [f.severity, f.message]);
    expect(codes(terminal)).toHaveLength(1);
    expect(codes(terminal)[0]![0]).toBe('error');
    expect(codes(editor)).toEqual(codes(terminal));
  });
});

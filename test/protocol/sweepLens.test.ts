// The code lens above a `sweep` line: the phase margin's range over the swept values and where it is
// lowest, the same numbers the sweep itself finds (its summary in the report).
import { describe, expect, it } from 'vitest';
import { codeLenses } from '../../server/src/features/codeLens';
import { analyzeDocument } from '../../shared/src/service';
import { formatDeg } from '../../shared/src/format/si';

const TEXT = `design buf
  param cl = 10 pF
  stage first  gm = 100 uS rout = 2 Mohm cap = 150 fF
  stage second gm = 1 mS rout = 200 kohm cap = 200 fF inverting
  node esr
  element res second esr = 300 ohm
  element cap esr gnd = cl
  miller first -> second cc = 2 pF
  require pm >= 45 deg
  sweep cl from 1 pF to 1 nF points 13
  corner slow first.gm = 80 uS
end
`;

describe('sweep code lens', () => {
  it('shows the phase margin range over the swept parameter and its worst value above the sweep line', () => {
    const report = analyzeDocument(TEXT);
    const lens = codeLenses(report, 'u').filter((l) => l.range.start.line === 9);
    expect(lens).toHaveLength(1);
    const pm = report.designs[0]!.sweeps![0]!.margins.phaseMarginDeg!;
    // The lowest is the refined one; the highest is a sampled one (the ends of this range).
    expect(pm.lowest.value).toBeLessThan(pm.highest);
    expect(lens[0]!.command!.title).toMatch(
      /^PM \d+\.\d–\d+\.\d° over cl \(worst \d+(\.\d+)? pF in (nominal|slow)\)$/,
    );
    expect(lens[0]!.command!.title).toContain(`${formatDeg(pm.lowest.value).replace('°', '')}–`);
    expect(lens[0]!.command!.title).toContain(`in ${pm.lowest.corner})`);
  });
});

// A small run of the server fuzz (scripts/fuzzServer.mjs runs a large one and prints figures): random and
// mutated documents through the bundled server, every feature at random positions.
import { execFileSync } from 'node:child_process';
import { beforeAll, describe, expect, it } from 'vitest';
import { ROOT } from './lspClient';
import { badRanges, badStrings, fuzzServer } from './serverFuzz';

beforeAll(() => {
  execFileSync(process.execPath, ['scripts/build.mjs'], { cwd: ROOT, stdio: 'inherit' });
}, 120_000);

describe('server fuzz', () => {
  it('finds a bad word and a range outside the text when there is one', () => {
    expect(badStrings({ contents: { value: 'UGF NaN Hz' } })).toEqual(['UGF NaN Hz']);
    expect(badStrings([{ label: 'poles [object Object]' }, { title: 'PM 61.0°' }])).toHaveLength(1);
    expect(badStrings({ uri: 'file:///Infinity.ampnote', title: 'moves the zero to infinity' })).toEqual([]);
    expect(badStrings(['gm = undefined S', 'its voltage is undefined'])).toEqual(['gm = undefined S']);
    // Two lines of 3 and 0 characters.
    expect(
      badRanges({ start: { line: 0, character: 0 }, end: { line: 0, character: 4 } }, [3, 0]),
    ).toHaveLength(1);
    expect(badRanges({ position: { line: 2, character: 0 } }, [3, 0])).toHaveLength(1);
    expect(
      badRanges({ start: { line: 1, character: 0 }, end: { line: 0, character: 1 } }, [3, 0]),
    ).toHaveLength(1);
    expect(badRanges({ start: { line: 0, character: 3 }, end: { line: 1, character: 0 } }, [3, 0])).toEqual(
      [],
    );
  });

  it('answers random documents without a crash, a hang, a bad word or a range outside the text', async () => {
    const figures = await fuzzServer({
      seed: 20240611,
      documents: 40,
      requestsPerDocument: 6,
      boundMs: 20_000,
    });
    expect(figures.examples).toEqual([]);
    expect(figures).toMatchObject({ crashes: 0, hangs: 0, badStrings: 0, badRanges: 0 });
    expect(figures.requests).toBeGreaterThanOrEqual(40 * 7);
  }, 120_000);
});

// The example outputs in docs/cli.md are what the checker prints today. Each paragraph that starts
// "Example (`ampnote …`" names a command, which is run from the repository root; the fenced block after
// the paragraph is compared with its standard output:
//   - a text block must equal the output;
//   - a ```json block is compared as data: every object has exactly the keys of the output's object, a string
//     ending in "…" stands for any text that starts the same, and where the paragraph says "abridged" an
//     array may show only its first elements.
// `AMPNOTE_UPDATE_DOCS=1 npx vitest run test/cli/docExamples.test.ts` writes the current outputs into the doc
// instead, keeping the JSON example as short as it was; read the diff, it is what users will see.
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { format, resolveConfig } from 'prettier';
import { beforeAll, describe, expect, it } from 'vitest';
import { cli, ensureBuilt, ROOT } from './helpers';

interface DocExample {
  /** Where the block's text starts and ends in the doc. */
  readonly start: number;
  readonly end: number;
  readonly args: string[];
  readonly abridged: boolean;
  readonly json: boolean;
  readonly body: string;
}

const DOC = join(ROOT, 'docs', 'cli.md');
const doc = readFileSync(DOC, 'utf8');
const update = process.env.AMPNOTE_UPDATE_DOCS === '1';
/** .prettierrc's printWidth. */
const PRINT_WIDTH = 110;

const examples: DocExample[] = [
  ...doc.matchAll(/^Example \(`ampnote ([^`]+)`([^\n]*(?:\n(?!\n)[^\n]*)*)\n\n```(\w*)\n([\s\S]*?)```/gm),
].map((m) => ({
  start: m.index + m[0].length - m[4]!.length - 3,
  end: m.index + m[0].length - 3,
  args: m[1]!.split(/\s+/),
  abridged: /abridged/.test(m[2]!),
  json: m[3] === 'json',
  body: m[4]!,
}));

beforeAll(() => ensureBuilt(), 300_000);

/** Where `shown` (from the doc) differs from `real` (the output), or undefined when it matches. */
function jsonMismatch(shown: unknown, real: unknown, abridged: boolean, path = '$'): string | undefined {
  if (isElided(shown) && typeof real === 'string') {
    return real.startsWith(shown.slice(0, -1)) ? undefined : `${path}: ${JSON.stringify(real)}`;
  }
  if (Array.isArray(shown)) {
    if (!Array.isArray(real)) return `${path}: not an array`;
    const fewer = abridged
      ? shown.length > real.length || (shown.length === 0) !== (real.length === 0)
      : false;
    if (fewer || (!abridged && shown.length !== real.length)) return `${path}: ${real.length} elements`;
    for (let i = 0; i < shown.length; i++) {
      const m = jsonMismatch(shown[i], real[i], abridged, `${path}[${i}]`);
      if (m) return m;
    }
    return undefined;
  }
  if (isObject(shown)) {
    if (!isObject(real)) return `${path}: not an object`;
    const keys = Object.keys(shown).sort();
    if (keys.join() !== Object.keys(real).sort().join())
      return `${path}: keys ${Object.keys(real).join(', ')}`;
    for (const k of keys) {
      const m = jsonMismatch(shown[k], real[k], abridged, `${path}.${k}`);
      if (m) return m;
    }
    return undefined;
  }
  return Object.is(shown, real) ? undefined : `${path}: ${JSON.stringify(real)}`;
}

const isElided = (v: unknown): v is string => typeof v === 'string' && v.endsWith('…');
const isObject = (v: unknown): v is Record<string, unknown> =>
  v !== null && typeof v === 'object' && !Array.isArray(v);

/**
 * JSON with a value on one line where it fits in Prettier's width (Prettier keeps an object expanded once it
 * is). `lead` is the width before the value on its line: indentation and key.
 */
function layout(value: unknown, indent: string, lead = indent.length): string {
  const oneLine = (v: unknown): string =>
    Array.isArray(v)
      ? `[${v.map(oneLine).join(', ')}]`
      : isObject(v)
        ? Object.keys(v).length === 0
          ? '{}'
          : `{ ${Object.entries(v)
              .map(([k, x]) => `${JSON.stringify(k)}: ${oneLine(x)}`)
              .join(', ')} }`
        : JSON.stringify(v);
  const flat = oneLine(value);
  // One more for the comma after the value.
  if (lead + flat.length + 1 <= PRINT_WIDTH || (!Array.isArray(value) && !isObject(value))) return flat;
  const inner = indent + '  ';
  const items = Array.isArray(value)
    ? value.map((x) => inner + layout(x, inner))
    : Object.entries(value as Record<string, unknown>).map(([k, x]) => {
        const key = `${inner}${JSON.stringify(k)}: `;
        return key + layout(x, inner, key.length);
      });
  const [open, close] = Array.isArray(value) ? ['[', ']'] : ['{', '}'];
  return `${open}\n${items.join(',\n')}\n${indent}${close}`;
}

/** The real output shaped like the doc's example: as many array elements, the same strings cut short. */
function refreshed(shown: unknown, real: unknown, abridged: boolean): unknown {
  if (isElided(shown) && typeof real === 'string' && real.startsWith(shown.slice(0, -1))) return shown;
  if (Array.isArray(shown) && Array.isArray(real)) {
    const kept = abridged ? real.slice(0, Math.max(1, shown.length)) : real;
    return kept.map((r, i) => (i < shown.length ? refreshed(shown[i], r, abridged) : r));
  }
  if (isObject(shown) && isObject(real)) {
    return Object.fromEntries(
      Object.entries(real).map(([k, v]) => [k, k in shown ? refreshed(shown[k], v, abridged) : v]),
    );
  }
  return real;
}

describe('docs/cli.md examples', () => {
  it('has the check, analyze and analyze --json examples', () => {
    expect(examples.map((e) => `${e.args[0]}${e.json ? ' --json' : ''}`)).toEqual(
      expect.arrayContaining(['check', 'analyze', 'analyze --json']),
    );
  });

  const outputs = new Map<DocExample, string>();
  for (const e of examples) {
    it(`ampnote ${e.args.join(' ')}`, () => {
      const r = cli(e.args);
      expect([0, 1]).toContain(r.status);
      outputs.set(e, r.stdout);
      if (update) return;
      if (e.json) {
        const mismatch = jsonMismatch(JSON.parse(e.body), JSON.parse(r.stdout), e.abridged);
        expect(mismatch, `the output now reads:\n${r.stdout}`).toBeUndefined();
      } else {
        expect(e.body).toBe(r.stdout);
      }
    });
  }

  it.runIf(update)('writes the current outputs into the doc', async () => {
    let text = doc;
    for (const e of [...examples].reverse()) {
      const out = outputs.get(e);
      if (out === undefined) continue;
      const body = e.json
        ? layout(refreshed(JSON.parse(e.body), JSON.parse(out), e.abridged), '') + '\n'
        : out;
      text = text.slice(0, e.start) + body + text.slice(e.end);
    }
    // Prettier lays out the JSON blocks as the rest of the docs are laid out.
    writeFileSync(DOC, await format(text, { ...(await resolveConfig(DOC)), filepath: DOC }));
  });
});

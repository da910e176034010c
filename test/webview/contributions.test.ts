// What the manifest promises matches the code: every check setting is contributed with the core's default,
// every command the client registers is declared, and the snippets are valid designs the engine can solve.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { DEFAULT_CHECK_SETTINGS } from '../../shared/src/checks/settings';
import { parseDocument } from '../../shared/src/language';
import { analyzeDesign } from '../../shared/src/analysis';
import { ROOT } from './harness';

const manifest = JSON.parse(readFileSync(join(ROOT, 'package.json'), 'utf8'));

describe('manifest', () => {
  it('contributes ampnote.checks.<key> for exactly the keys of CheckSettings, resource-scoped, same defaults', () => {
    const props = manifest.contributes.configuration.properties as Record<
      string,
      { default: unknown; scope: string }
    >;
    const checks = Object.keys(props).filter((k) => k.startsWith('ampnote.checks.'));
    expect(checks.map((k) => k.slice('ampnote.checks.'.length)).sort()).toEqual(
      Object.keys(DEFAULT_CHECK_SETTINGS).sort(),
    );
    for (const [key, value] of Object.entries(DEFAULT_CHECK_SETTINGS)) {
      expect(props[`ampnote.checks.${key}`]).toMatchObject({
        default: value,
        scope: 'resource',
        type: 'number',
      });
    }
    expect(props['ampnote.trace.server']).toMatchObject({
      default: 'off',
      enum: ['off', 'messages', 'verbose'],
    });
  });

  it('declares every command the client registers, all under the Ampnote category', () => {
    const source = readFileSync(join(ROOT, 'client/src/commands.ts'), 'utf8');
    const registered = [...source.matchAll(/registerCommand\(\s*'([^']+)'/g)].map((m) => m[1]).sort();
    const declared = manifest.contributes.commands as { command: string; category: string }[];
    expect(declared.map((c) => c.command).sort()).toEqual(registered);
    expect(new Set(declared.map((c) => c.category))).toEqual(new Set(['Ampnote']));
    expect(manifest.activationEvents).toContain('onLanguage:ampnote');
    expect(manifest.capabilities.untrustedWorkspaces.supported).toBe(true);
  });
});

describe('snippets', () => {
  const snippets = JSON.parse(readFileSync(join(ROOT, 'snippets/ampnote.json'), 'utf8')) as Record<
    string,
    { body: string[] }
  >;
  /** The text a user gets by accepting every placeholder's default. */
  const expand = (body: string[]) =>
    body
      .join('\n')
      .replace(/\$\{\d+:([^}]*)\}/g, '$1')
      .replace(/\$\d+/g, '');

  it.each(Object.entries(snippets))('%s expands to a design that parses cleanly and solves', (_name, s) => {
    const doc = parseDocument(expand(s.body));
    expect(doc.diagnostics).toEqual([]);
    expect(doc.designs.length).toBe(1);
    const analysis = analyzeDesign(doc.designs[0]!.nominal!);
    expect(analysis.problems).toEqual([]);
    expect(analysis.loop.ugfHz).toBeGreaterThan(0);
  });
});

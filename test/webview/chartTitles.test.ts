// A chart has one title everywhere people read it: the panel's cards, the report's figures (drawn from the
// same table, checked in test/cli/report.test.ts), the README, the terminal checker's help and its docs.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { CHARTS } from '../../shared/src/charts/descriptors';
import { panelHtml } from '../../client/src/panelHtml';
import { usage } from '../../cli/src/usage';
import { ROOT } from './harness';

const titles: readonly string[] = CHARTS.map((c) => c.title);
const read = (path: string) => readFileSync(join(ROOT, path), 'utf8');
/** Markdown's `_Title_` emphasis, across a line break, in the order written. */
const emphasised = (text: string) =>
  [...text.matchAll(/_([A-Z][^_]*)_/g)].map((m) => m[1]!.replace(/\s+/g, ' '));

describe('chart titles', () => {
  it('are distinct, and so are ids and file names', () => {
    for (const key of ['id', 'title', 'fileName'] as const) {
      expect(new Set(CHARTS.map((c) => c[key])).size, key).toBe(CHARTS.length);
    }
  });

  it('the panel shows one card per chart, in the table order, with its title', () => {
    const html = panelHtml({ nonce: 'n', cspSource: 'x', scriptUri: 's', styleUri: 'c' });
    const cards = [...html.matchAll(/data-action="select" data-chart="([^"]+)"[^>]*>([^<]*)</g)];
    expect(cards.map((m) => m[1])).toEqual(CHARTS.map((c) => c.id));
    expect(cards.map((m) => m[2])).toEqual(titles);
  });

  it('the README names the panel charts by their titles', () => {
    const readme = read('README.md');
    const bullet = readme.slice(readme.indexOf('- **Pole-split panel**'));
    expect(emphasised(bullet.slice(0, bullet.indexOf('\n- ')))).toContain('Ampnote: Show Pole-Split Panel');
    expect(emphasised(bullet.slice(0, bullet.indexOf('\n- '))).filter((t) => titles.includes(t))).toEqual(
      titles,
    );
  });

  it('the report help and docs/cli.md name the report charts by their titles', () => {
    expect(usage('report').replace(/\s+/g, ' ')).toContain(`(${titles.join(', ')})`);
    const doc = read('docs/cli.md');
    const section = doc.slice(doc.indexOf('## `ampnote report'));
    const intro = section.slice(0, section.indexOf('\n\n', section.indexOf('\n\n') + 2));
    expect(emphasised(intro)).toEqual(titles);
  });
});

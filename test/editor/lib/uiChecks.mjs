// What a person sees: squiggles, the problems count, the hover, the status bar and the chart panel,
// checked in the workbench page against the terminal checker's findings.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import {
  focusFirstGroup,
  goToLine,
  lineText,
  statusBarPm,
  poll,
  problemCounts,
  quickOpen,
  runCommand,
  screenshot,
  squiggleLines,
} from './browser.mjs';
import { hzValuesIn } from './hzValues.mjs';

const SEVERITY_CLASS = { error: 'error', warning: 'warning', info: 'info' };

/** The file whose findings make the most telling picture: most errors and warnings, a Miller line first. */
function pickShowcase(expected, workspace) {
  const scored = expected.map((e) => {
    const text = readFileSync(join(workspace, e.file), 'utf8');
    const strong = e.findings.filter((f) => f.severity !== 'info').length;
    // The project's examples make the picture; the tests' own fixtures only when there is nothing else.
    const own = e.file.includes('/') ? -1000 : 0;
    // A design with free parameters shows their sliders instead of the Cc slider these checks move.
    const free = /^\s*param\b.*\bfree\b/m.test(text) ? -50 : 0;
    return { e, score: own + free + strong + (/^\s*miller\b/m.test(text) ? 100 : 0) };
  });
  scored.sort((a, b) => b.score - a.score);
  return scored[0]?.e;
}

/**
 * A Miller keyword that no finding covers, so the hover shows the analysis alone (else any Miller line).
 */
function hoverSpot(expected, workspace) {
  let fallback;
  for (const e of expected) {
    const lines = readFileSync(join(workspace, e.file), 'utf8').split(/\r?\n/);
    for (const [line, text] of lines.entries()) {
      if (!/^\s*miller\b/.test(text)) continue;
      const column = text.search(/\S/);
      const spot = { file: e.file, line, column };
      fallback ??= spot;
      const covered = e.findings.some((f) => {
        const { start, end } = f.range;
        const after = line > start.line || (line === start.line && column + 1 >= start.character);
        const before = line < end.line || (line === end.line && column + 1 <= end.character);
        return after && before;
      });
      if (!covered) return spot;
    }
  }
  return fallback;
}

/**
 * Every error and warning visible on screen has a squiggle of its kind on its first line, and every
 * squiggled line lies inside a finding of that kind: the picture matches the findings both ways.
 */
async function squigglesMatch(page, findings) {
  return poll(
    'squiggles on the lines of the findings',
    async () => {
      const seen = await squiggleLines(page);
      const visible = new Set(seen.visible);
      for (const f of findings) {
        const line = f.range.start.line + 1;
        if (!visible.has(line)) continue;
        if (!seen[SEVERITY_CLASS[f.severity]].includes(line)) return undefined;
      }
      for (const kind of ['error', 'warning']) {
        for (const line of seen[kind]) {
          const inside = findings.some(
            (f) => f.severity === kind && line >= f.range.start.line + 1 && line <= f.range.end.line + 1,
          );
          if (!inside) throw new Error(`a ${kind} squiggle on line ${line} belongs to no finding`);
        }
      }
      const shown = findings.filter((f) => f.severity !== 'info' && visible.has(f.range.start.line + 1));
      if (findings.some((f) => f.severity !== 'info') && shown.length === 0) {
        throw new Error('no error or warning finding lies in the visible part of the editor');
      }
      return seen;
    },
    30_000,
  );
}

function counts(findings) {
  const c = { error: 0, warning: 0, info: 0 };
  for (const f of findings) c[f.severity] += 1;
  return c;
}

/** The status bar's problems item agrees with the findings (of this file, or of every file published). */
async function problemsMatch(page, expected, file) {
  const one = counts(expected.find((e) => e.file === file).findings);
  const all = counts(expected.flatMap((e) => e.findings));
  let last;
  try {
    return await poll(
      'the problems count in the status bar',
      async () => {
        last = await problemCounts(page);
        const same = (c) => c.error === last.error && c.warning === last.warning;
        return same(one) || same(all) ? last : undefined;
      },
      20_000,
    );
  } catch (err) {
    throw new Error(
      `${err.message}; status bar says "${last?.label}", findings: ${JSON.stringify(one)} in ${file}, ${JSON.stringify(all)} in all`,
    );
  }
}

function commandTitle(root, id) {
  const pkg = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8'));
  const c = (pkg.contributes?.commands ?? []).find((x) => x.command === id);
  if (!c) throw new Error(`package.json contributes no command ${id}`);
  return c.category ? `${c.category}: ${c.title}` : c.title;
}

/** tally.check with a screenshot of the page when the check fails. */
function checker(tally, page, output) {
  let n = 0;
  return (name, fn, timeoutMs) =>
    tally.check(
      name,
      async () => {
        try {
          return await fn();
        } catch (err) {
          n += 1;
          const slug = name.replace(/[^a-z0-9]+/gi, '-').slice(0, 60);
          await screenshot(page, output, `FAIL-${n}-${slug}`).catch(() => {});
          throw err;
        }
      },
      timeoutMs,
    );
}

export async function uiChecks({ page, tally, expected, workspace, output, root }) {
  const check = checker(tally, page, output);
  const show = pickShowcase(expected, workspace);
  if (!show) throw new Error('no example to show');
  const lines = readFileSync(join(workspace, show.file), 'utf8').split(/\r?\n/);

  await check(`UI: ${show.file} shows squiggles on the lines of its findings`, async () => {
    await quickOpen(page, show.file);
    await squigglesMatch(page, show.findings);
    await screenshot(page, output, 'squiggles');
  });

  await check(`UI: the problems count in the status bar matches the findings`, async () => {
    const c = await problemsMatch(page, expected, show.file);
    console.log(`        status bar: "${c.label}"`);
  });

  const millerLine = lines.findIndex((l) => /^\s*miller\b/.test(l));
  const spot = hoverSpot(expected, workspace) ?? { file: show.file, line: millerLine, column: 0 };
  await check(`UI: the hover over the Miller capacitor in ${spot.file} shows its poles`, async () => {
    if (spot.line < 0) throw new Error('no example has a miller line');
    const design = expected
      .find((e) => e.file === spot.file)
      .designs.find((d) => d.range.start.line <= spot.line && spot.line <= d.range.end.line);
    if (!design) throw new Error(`the checker knows no design around ${spot.file}:${spot.line + 1}`);
    const want = [...design.polesHz].sort((a, b) => a - b).slice(0, 2);
    if (want.length < 2) throw new Error(`the checker reports ${want.length} pole(s) for ${design.name}`);
    await quickOpen(page, spot.file);
    await goToLine(page, spot.line + 1, spot.column + 2);
    await page.keyboard.press('Control+K');
    await page.keyboard.press('Control+I');
    const hover = page.locator('.monaco-hover:not(.hidden)').first();
    // The dominant pole and the first non-dominant one, within display rounding of the checker's values.
    const text = await poll(
      'the hover widget to show the two lowest poles',
      async () => {
        if (!(await hover.isVisible())) return undefined;
        const t = await hover.innerText();
        const hz = hzValuesIn(t);
        return /pole/i.test(t) && want.every((p) => hz.some((v) => Math.abs(v - p) <= 0.01 * p))
          ? t
          : undefined;
      },
      15_000,
    ).catch(async (err) => {
      const t = (await hover.isVisible()) ? await hover.innerText() : '(no hover)';
      throw new Error(
        `${err.message}; wanted ${want.map((p) => p.toPrecision(3)).join(', ')} Hz, hover:\n${t}`,
      );
    });
    console.log(`        hover: ${text.replace(/\s+/g, ' ').slice(0, 160)}`);
    await screenshot(page, output, 'hover');
    await page.keyboard.press('Escape');
    await quickOpen(page, show.file);
  });

  await check('UI: the status bar shows the phase margin of the design under the cursor', async () => {
    await goToLine(page, Math.max(1, millerLine + 1), 1);
    const line = Math.max(0, millerLine);
    const design = show.designs.find((d) => d.range.start.line <= line && line <= d.range.end.line);
    if (!design) throw new Error(`the checker knows no design around line ${line + 1}`);
    // Shown with one decimal: within 0.05° of the nominal or the worst-corner value the checker computes.
    // The item follows the cursor after a rest, so the previous editor's value may show for a moment.
    const near = (v, shown) => v !== null && Math.abs(v - shown) <= 0.051;
    let last;
    const shown = await poll(`the status bar PM of ${design.name}`, async () => {
      last = await statusBarPm(page);
      if (last === undefined) return undefined;
      return near(design.phaseMarginDeg.nominal, last) || near(design.phaseMarginDeg.worst, last)
        ? last
        : undefined;
    }).catch((err) => {
      throw new Error(
        `${err.message}: it shows ${last}°, the checker ${JSON.stringify(design.phaseMarginDeg)}`,
      );
    });
    const items = await page.locator('#workbench\\.parts\\.statusbar .statusbar-item').allInnerTexts();
    const text = items.find((t) => /PM/.test(t)) ?? '';
    console.log(`        status bar item: "${text.replace(/\s+/g, ' ').trim()}" (PM ${shown}°)`);
  });

  let frame;
  await check('UI: the panel opens from the command palette and draws its charts', async () => {
    await goToLine(page, Math.max(1, millerLine + 1), 1);
    await runCommand(page, commandTitle(root, 'ampnote.showPanel'));
    frame = page.frameLocator('iframe.webview.ready').frameLocator('#active-frame');
    await poll(
      'a drawn chart in the panel',
      async () => ((await canvasInk(frame)) > 0 ? true : undefined),
      30_000,
    );
    await screenshot(page, output, 'panel');
  });

  await check('UI: the panel carries the small-signal caution', async () => {
    if (!frame) throw new Error('the panel did not open');
    const text = await frame.locator('#caution').innerText({ timeout: 10_000 });
    if (!/small-signal/i.test(text)) throw new Error(`caution reads "${text}"`);
  });

  await check('UI: moving the Cc slider redraws the poles', async () => {
    if (!frame) throw new Error('the panel did not open');
    const slider = frame.locator('#cc-slider');
    await slider.waitFor({ state: 'visible', timeout: 10_000 });
    const before = await panelFingerprint(frame);
    const { min, max, value } = await slider.evaluate((el) => ({
      min: el.min,
      max: el.max,
      value: el.value,
    }));
    // Far from where it is, so the poles move visibly.
    const target = Number(value) - Number(min) > Number(max) - Number(value) ? min : max;
    await slider.fill(String(target));
    const after = await poll(
      'the poles-and-zeros chart and the summary to change after the slider moved',
      async () => {
        const now = await panelFingerprint(frame);
        return now.splane !== before.splane && now.summary !== before.summary ? now : undefined;
      },
      20_000,
    );
    console.log(`        summary before: ${before.summary.replace(/\s+/g, ' ')}`);
    console.log(`        summary after:  ${after.summary.replace(/\s+/g, ' ')}`);
    await screenshot(page, output, 'panel-slider');
  });

  await check(
    'UI: Apply to file writes the slider value into the Miller line; one undo takes it back',
    async () => {
      if (!frame) throw new Error('the panel did not open');
      const line = millerLine + 1;
      const before = await lineText(page, line);
      if (before === undefined) throw new Error(`line ${line} is not on screen`);
      const shown = await frame.locator('#cc-value').innerText();
      await frame.locator('#apply').click();
      const after = await poll('the Miller line to take the value', async () => {
        const t = await lineText(page, line);
        return t !== undefined && t !== before ? t : undefined;
      });
      console.log(`        slider ${shown.trim()}: "${before.trim()}" → "${after.trim()}"`);
      const want = faradsIn(shown);
      const got = faradsIn(after.slice(after.indexOf('cc')));
      if (want === undefined || got === undefined || Math.abs(got - want) > 0.01 * want) {
        throw new Error(`the slider shows ${shown} but the line reads "${after.trim()}"`);
      }
      await focusFirstGroup(page, show.file);
      await page.keyboard.press('Control+Z');
      await goToLine(page, line, 1);
      await poll('one undo to restore the line as written', async () =>
        (await lineText(page, line)) === before ? true : undefined,
      );
    },
  );

  await check('UI: Analyze File lists the designs with their phase margin', async () => {
    // The command is offered for .ampnote editors: bring the file back in front of the panel.
    await focusFirstGroup(page, show.file);
    await runCommand(page, commandTitle(root, 'ampnote.analyzeFile'));
    const rows = page.locator('.quick-input-widget .monaco-list-row');
    const texts = await poll('the list of designs', async () => {
      const t = await rows.allInnerTexts();
      return t.length > 0 && t.every((x) => /PM/.test(x)) ? t : undefined;
    });
    console.log(`        ${texts.map((t) => t.replace(/\s+/g, ' ')).join(' | ')}`);
    // One row per design of the file, each with the phase margin the checker computes for it.
    const designs = show.designs;
    if (texts.length !== designs.length) {
      throw new Error(
        `${texts.length} row(s) for ${designs.length} design(s) (${designs.map((d) => d.name).join(', ')})`,
      );
    }
    for (const d of designs) {
      const row = texts.find((t) => t.includes(d.name));
      const m = row?.match(/PM\s*([-−]?\d+(?:\.\d+)?)\s*°/);
      if (!m) throw new Error(`no row with a phase margin for design ${d.name}`);
      const shown = Number(m[1].replace('−', '-'));
      const near = (v) => v !== null && Math.abs(v - shown) <= 0.051;
      if (!near(d.phaseMarginDeg.nominal) && !near(d.phaseMarginDeg.worst)) {
        throw new Error(
          `row for ${d.name} shows PM ${shown}°, the checker ${JSON.stringify(d.phaseMarginDeg)}`,
        );
      }
    }
    await screenshot(page, output, 'analyze-file');
    await page.keyboard.press('Escape');
  });

  const fixTarget = preferredPmFix(expected);
  await check(
    'UI: the quick-fix menu (Ctrl+.) applies the preferred phase-margin fix; undo restores',
    async () => {
      if (!fixTarget)
        throw new Error('no example has a phase-margin finding with a preferred fix that sets a value');
      const { file, finding, title, pm, design } = fixTarget;
      const line = finding.range.start.line + 1;
      await quickOpen(page, file);
      await goToLine(page, line, finding.range.start.character + 2);
      const before = await lineText(page, line);
      // The status bar follows the cursor after a rest: wait for this design's own value.
      const pmBefore = await poll(`the status bar PM of ${design?.name ?? 'the design'}`, async () => {
        const v = await statusBarPm(page);
        if (v === undefined || !design) return v;
        const near = (x) => x !== null && Math.abs(x - v) <= 0.051;
        return near(design.phaseMarginDeg.nominal) || near(design.phaseMarginDeg.worst) ? v : undefined;
      });
      await page.keyboard.press('Control+.');
      // The preferred fix is the one the menu puts the focus on; Enter applies it, as a person would.
      const item = page.locator('.action-widget .monaco-list-row.focused', { hasText: title }).first();
      await item.waitFor({ state: 'visible', timeout: 15_000 });
      await screenshot(page, output, 'quick-fix-menu');
      await page.keyboard.press('Enter');
      const after = await poll('the fix to edit the line', async () => {
        const t = await lineText(page, line);
        return t !== undefined && t !== before ? t : undefined;
      });
      // Without corners the status bar's PM is the nominal one the fix solved for.
      const single = design && design.phaseMarginDeg.nominal === design.phaseMarginDeg.worst;
      const pmAfter = await poll(`the status bar PM to reach ${pm}°`, async () => {
        const v = await statusBarPm(page);
        if (v === undefined || v === pmBefore) return undefined;
        return !single || v >= pm - 0.051 ? v : undefined;
      });
      console.log(
        `        "${title}": "${before.trim()}" → "${after.trim()}", PM ${pmBefore}° → ${pmAfter}°`,
      );
      await screenshot(page, output, 'quick-fix-applied');
      await page.keyboard.press('Control+Z');
      await poll('undo to restore the line and the PM', async () =>
        (await lineText(page, line)) === before && (await statusBarPm(page)) === pmBefore ? true : undefined,
      );
    },
  );

  // A design with free parameters: the panel shows a slider for each, and Solve meets every requirement.
  const freeFile = expected
    .map((e) => e.file)
    .find((f) => /\bfree\b[^\n#]*\.\./.test(readFileSync(join(workspace, f), 'utf8')));
  await check(
    'UI: the panel of a design with free parameters has their sliders, and Solve meets every requirement',
    async () => {
      if (!freeFile) throw new Error('no example has free parameters');
      const text = readFileSync(join(workspace, freeFile), 'utf8');
      const freeCount = text.split(/\r?\n/).filter((l) => /^\s*param\s+\w+\s*=.*\bfree\b/.test(l)).length;
      await quickOpen(page, freeFile);
      await goToLine(page, 1, 1);
      await runCommand(page, commandTitle(root, 'ampnote.showPanel'));
      const panel = page.frameLocator('iframe.webview.ready').last().frameLocator('#active-frame');
      const sliders = panel.locator('#free-sliders .free-slider');
      await poll(
        `${freeCount} free-parameter sliders`,
        async () => ((await sliders.count()) === freeCount ? true : undefined),
        30_000,
      );
      const failing = panel.locator('#free-reqs li.fail');
      await poll('a failing requirement before the solve', async () =>
        (await failing.count()) > 0 ? true : undefined,
      );
      await panel.locator('#free-solve').click();
      await poll(
        'every requirement to pass after Solve',
        async () => {
          const total = await panel.locator('#free-reqs li').count();
          return total > 0 && (await failing.count()) === 0 ? true : undefined;
        },
        60_000,
      );
      console.log(`        ${(await panel.locator('#free-objective').innerText()).replace(/\s+/g, ' ')}`);
      await screenshot(page, output, 'panel-free-solved');
    },
  );

  // A design with a sweep: its code lens names the worst value, and the panel draws the sweep's charts.
  // The shortest such file, so the whole design is on screen.
  const sweepFile = expected
    .map((e) => ({ file: e.file, text: readFileSync(join(workspace, e.file), 'utf8') }))
    .filter((e) => /^\s*sweep\s/m.test(e.text))
    .sort((a, b) => a.text.length - b.text.length)[0]?.file;
  await check(
    'UI: a design with a sweep shows its phase-margin lens, and the panel draws the sweep charts',
    async () => {
      if (!sweepFile) throw new Error('no example has a sweep');
      const lines = readFileSync(join(workspace, sweepFile), 'utf8').split(/\r?\n/);
      const sweepLine = lines.findIndex((l) => /^\s*sweep\s/.test(l));
      const param = lines[sweepLine].trim().split(/\s+/)[1];
      await quickOpen(page, sweepFile);
      // The file may open in the panel's group, not the first: go to the line in the editor just opened
      // (it has the focus), which goToLine (first group) would not.
      await page.keyboard.press('Control+G');
      const input = page.locator('.quick-input-widget input');
      await input.waitFor({ state: 'visible', timeout: 10_000 });
      await input.fill(`:${sweepLine + 1}:1`);
      await page.keyboard.press('Enter');
      await input.waitFor({ state: 'hidden', timeout: 10_000 });
      const lens = await poll(
        `the code lens above the sweep of ${param}`,
        async () => {
          const texts = await page.locator('.codelens-decoration').allInnerTexts();
          return texts.find((t) => new RegExp(`PM .* over ${param} \\(worst`).test(t));
        },
        60_000,
      );
      console.log(`        code lens: "${lens.replace(/\s+/g, ' ').trim()}"`);
      await runCommand(page, commandTitle(root, 'ampnote.showPanel'));
      const panel = page.frameLocator('iframe.webview.ready').last().frameLocator('#active-frame');
      await poll(
        'the sweep charts drawn in the panel',
        async () => {
          if (!(await panel.locator('#card-sweep-margins').isVisible())) return undefined;
          const ink = await canvasInkOf(panel, ['chart-sweep-margins', 'chart-sweep-locus']);
          return ink.every((n) => n > 500) ? true : undefined;
        },
        60_000,
      );
      const note = await panel.locator('#note-sweep-margins').innerText();
      if (!/Lowest phase margin/.test(note)) throw new Error(`the sweep chart's note reads "${note}"`);
      console.log(`        ${note.replace(/\s+/g, ' ')}`);
      await panel.locator('#card-sweep-margins').scrollIntoViewIfNeeded();
      await screenshot(page, output, 'panel-sweep');
    },
    120_000,
  );

  await circuitLoopChecks({ page, expected, workspace, output, root, check });
}

/**
 * Every example whose loop is written as a circuit (`feedback at`): the panel draws the loop gain of the
 * real loop and the closed circuit's charts (output impedance, load step; supply rejection when the design
 * has a supply), each screenshot as `panel-circuit-<file>`.
 */
async function circuitLoopChecks({ page, expected, workspace, output, root, check }) {
  const files = expected
    .filter((e) => !e.file.includes('/'))
    .map((e) => ({ file: e.file, text: readFileSync(join(workspace, e.file), 'utf8') }))
    .filter((e) => /^\s*feedback\s+at\s/m.test(e.text));
  await check('UI: the project has examples whose loop is written as a circuit', async () => {
    if (files.length < 2) throw new Error(`only ${files.length} example(s) use \`feedback at\``);
  });
  for (const { file, text } of files) {
    const supply = /^\s*supply\s/m.test(text);
    const ids = [
      'chart-bode',
      'chart-zout',
      'chart-load-step',
      ...(supply ? ['chart-supply-rejection'] : []),
    ];
    await check(
      `UI: ${file}: the panel draws the real loop and the closed circuit's charts (${ids.join(', ')})`,
      async () => {
        const lines = text.split(/\r?\n/);
        const at = lines.findIndex((l) => /^\s*feedback\s+at\s/.test(l));
        await quickOpen(page, file);
        await page.keyboard.press('Control+G');
        const input = page.locator('.quick-input-widget input');
        await input.waitFor({ state: 'visible', timeout: 10_000 });
        await input.fill(`:${at + 1}:1`);
        await page.keyboard.press('Enter');
        await input.waitFor({ state: 'hidden', timeout: 10_000 });
        await runCommand(page, commandTitle(root, 'ampnote.showPanel'));
        const panel = page.frameLocator('iframe.webview.ready').last().frameLocator('#active-frame');
        await poll(
          `the closed circuit's charts of ${file}`,
          async () => {
            if (!(await panel.locator('#card-zout').isVisible())) return undefined;
            const ink = await canvasInkOf(panel, ids);
            return ink.every((n) => n > 500) ? true : undefined;
          },
          60_000,
        );
        const note = await panel.locator('#note-zout').innerText();
        console.log(`        ${file}: ${note.replace(/\s+/g, ' ')}`);
        await panel.locator('#card-zout').scrollIntoViewIfNeeded();
        await screenshot(page, output, `panel-circuit-${file.replace(/\.ampnote$/, '')}`);
      },
      120_000,
    );
  }
}

/** A phase-margin finding whose preferred fix sets a value for a stated margin, examples first. */
function preferredPmFix(expected) {
  const ordered = [...expected].sort((a, b) => Number(a.file.includes('/')) - Number(b.file.includes('/')));
  for (const e of ordered) {
    for (const f of e.findings.filter((x) => x.code === 'phase-margin')) {
      // `Set cc = 1.6 pF (phase margin 60.0°)`: the title gives the margin the rounded value reaches.
      const fix = f.fixes?.find((x) => x.preferred && /\(phase margin\s+([\d.]+)\s*°/.test(x.title));
      if (!fix) continue;
      const pm = Number(fix.title.match(/\(phase margin\s+([\d.]+)\s*°/)[1]);
      const design = e.designs.find(
        (d) => d.range.start.line <= f.range.start.line && f.range.start.line <= d.range.end.line,
      );
      return { file: e.file, finding: f, title: fix.title, pm, design };
    }
  }
  return undefined;
}

/** A capacitance written with an SI prefix (`1.6 pF`, `820 fF`) in farads; undefined when none. */
function faradsIn(text) {
  const m = text.match(/(\d+(?:\.\d+)?(?:[eE][-+]?\d+)?)\s*([afpnuµm]?)F\b/);
  if (!m) return undefined;
  const scale = { a: 1e-18, f: 1e-15, p: 1e-12, n: 1e-9, u: 1e-6, µ: 1e-6, m: 1e-3, '': 1 }[m[2]];
  return Number(m[1]) * scale;
}

/** Diagnostics of the packaged extension on one example, seen in the UI. */
export async function smokeChecks({ page, tally, expected, output, label }) {
  const check = checker(tally, page, output);
  const target = expected.find((e) => e.findings.some((f) => f.severity !== 'info')) ?? expected[0];
  await check(
    `${label}: ${target.file} shows squiggles on the lines of its findings`,
    async () => {
      await quickOpen(page, target.file);
      await squigglesMatch(page, target.findings);
      await screenshot(page, output, `${label}-squiggles`);
    },
    90_000,
  );
  await check(`${label}: the problems count in the status bar matches the findings`, async () => {
    const c = await problemsMatch(page, expected, target.file);
    console.log(`        status bar: "${c.label}"`);
  });
}

/** How many pixels of all the panel's canvases are not transparent (0 when nothing is drawn). */
async function canvasInk(frame) {
  return frame.locator('body').evaluate(() => {
    let ink = 0;
    for (const c of document.querySelectorAll('canvas')) {
      if (c.width === 0 || c.height === 0) continue;
      const ctx = c.getContext('2d');
      if (!ctx) continue;
      const d = ctx.getImageData(0, 0, c.width, c.height).data;
      for (let i = 3; i < d.length; i += 4) if (d[i] !== 0) ink += 1;
    }
    return ink;
  });
}

/** Pixels that are not transparent in each of the named canvases. */
async function canvasInkOf(frame, ids) {
  return frame.locator('body').evaluate((_, ids) => {
    return ids.map((id) => {
      const c = document.getElementById(id);
      const ctx = c && c.width > 0 && c.height > 0 ? c.getContext('2d') : null;
      if (!ctx) return 0;
      const d = ctx.getImageData(0, 0, c.width, c.height).data;
      let ink = 0;
      for (let i = 3; i < d.length; i += 4) if (d[i] !== 0) ink += 1;
      return ink;
    });
  }, ids);
}

/** A checksum of the poles-and-zeros chart's pixels and the summary's text: both change when the poles move. */
async function panelFingerprint(frame) {
  return frame.locator('body').evaluate(() => {
    let sum = 0;
    const c = document.getElementById('chart-splane');
    const ctx = c && c.width > 0 ? c.getContext('2d') : null;
    if (ctx) {
      const d = ctx.getImageData(0, 0, c.width, c.height).data;
      for (let i = 0; i < d.length; i += 7) sum = (sum * 31 + d[i]) % 1_000_000_007;
    }
    return { splane: sum, summary: document.getElementById('summary')?.innerText ?? '' };
  });
}

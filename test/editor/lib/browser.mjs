// Debian's Chromium driven by playwright-core, and the few workbench gestures the UI checks need.
import { chromium } from 'playwright-core';
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';

const CHROMIUM = '/usr/bin/chromium';
const FLAGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

/** `xdgDir`: where Chromium may write outside its profile (crash-report settings), instead of home. */
export async function launchBrowser(xdgDir) {
  const env = { ...process.env };
  if (xdgDir) {
    for (const k of ['XDG_CONFIG_HOME', 'XDG_CACHE_HOME']) {
      env[k] = join(xdgDir, k.toLowerCase());
      mkdirSync(env[k], { recursive: true });
    }
  }
  // launch() gives every run a fresh, throw-away profile.
  // The runner's own signal handlers stop the browser along with the editor, in order.
  return chromium.launch({
    executablePath: CHROMIUM,
    headless: true,
    args: FLAGS,
    env,
    timeout: 60_000,
    handleSIGINT: false,
    handleSIGTERM: false,
    handleSIGHUP: false,
  });
}

/** A page of the workbench, loaded and ready for keyboard input. */
export async function openWorkbench(browser, url, { onExit, consoleLines } = {}) {
  const context = await browser.newContext({ viewport: { width: 1400, height: 900 } });
  const page = await context.newPage();
  if (consoleLines) {
    page.on('console', (m) => {
      consoleLines.push(`[${m.type()}] ${m.text()}`);
      if (consoleLines.length > 2000) consoleLines.splice(0, 1000);
    });
  }
  if (onExit) await page.exposeFunction('codeAutomationExit', (code) => onExit(code));
  await page.goto(url, { waitUntil: 'domcontentloaded', timeout: 60_000 });
  await page.locator('.monaco-workbench').waitFor({ state: 'visible', timeout: 60_000 });
  return page;
}

export async function screenshot(page, dir, name) {
  mkdirSync(dir, { recursive: true });
  const file = join(dir, `${name}.png`);
  await page.screenshot({ path: file });
  return file;
}

/** Opens a workspace file by name through quick open; resolves when its editor tab is active. */
export async function quickOpen(page, fileName) {
  await focusWorkbench(page);
  await page.keyboard.press('Control+P');
  const input = page.locator('.quick-input-widget input');
  await input.waitFor({ state: 'visible', timeout: 15_000 });
  await input.fill(fileName);
  // Enter takes the focused row: wait until filtering has put the file there, not a recent one.
  await page
    .locator('.quick-input-widget .monaco-list-row.focused', { hasText: fileName })
    .first()
    .waitFor({ state: 'visible', timeout: 15_000 });
  await page.keyboard.press('Enter');
  await page
    .locator('.tabs-container .tab.active', { hasText: fileName.split('/').pop() })
    .waitFor({ state: 'visible', timeout: 15_000 });
  await page.locator('.editor-instance .monaco-editor .view-lines').first().waitFor({ state: 'visible' });
}

/** Puts keyboard focus in the first editor group and waits until its active editor is `fileName`. */
export async function focusFirstGroup(page, fileName) {
  await page.keyboard.press('Escape');
  // Focus may sit inside a webview's frame; a click on the group's active tab brings it back without
  // moving the cursor.
  await page.locator('.editor-group-container').first().locator('.tab.active').first().click();
  await page.keyboard.press('Control+1');
  await poll(`the editor of ${fileName} to be in front`, async () =>
    (await page.title()).includes(fileName) ? true : undefined,
  );
}

/** Runs a command from the palette by its title, as a person would. */
export async function runCommand(page, title) {
  await focusWorkbench(page);
  await page.keyboard.press('Control+Shift+P');
  const input = page.locator('.quick-input-widget input');
  await input.waitFor({ state: 'visible', timeout: 15_000 });
  await input.fill(`>${title}`);
  await page
    .locator('.quick-input-widget .monaco-list-row.focused', { hasText: title })
    .first()
    .waitFor({ state: 'visible', timeout: 15_000 });
  await page.keyboard.press('Enter');
  // The palette has closed, or the command opened a quick pick of its own in the same widget.
  await poll(
    `the command palette to run "${title}"`,
    async () =>
      !(await input.isVisible()) || !(await input.inputValue()).startsWith('>') ? true : undefined,
    15_000,
  );
}

/** Moves the cursor to a one-based line and column of the active editor. */
export async function goToLine(page, line, column = 1) {
  await page.locator('.editor-instance .monaco-editor textarea').first().focus();
  await page.keyboard.press('Control+G');
  const input = page.locator('.quick-input-widget input');
  await input.waitFor({ state: 'visible', timeout: 10_000 });
  await input.fill(`:${line}:${column}`);
  await page.keyboard.press('Enter');
  await input.waitFor({ state: 'hidden', timeout: 10_000 });
}

async function focusWorkbench(page) {
  // Escape closes any open widget; a click on the status bar's empty area would move focus unpredictably.
  await page.keyboard.press('Escape');
}

/**
 * The one-based editor lines that carry a squiggle of each kind, read from where the decorations are
 * drawn relative to the line numbers in the gutter.
 */
export async function squiggleLines(page) {
  return page.evaluate(() => {
    const editor = document.querySelector('.editor-instance .monaco-editor');
    if (!editor) return { error: [], warning: [], info: [] };
    const numbers = [...editor.querySelectorAll('.margin-view-overlays .line-numbers')].map((el) => {
      const r = el.getBoundingClientRect();
      return { line: Number(el.textContent?.trim()), top: r.top, bottom: r.bottom };
    });
    const lineAt = (el) => {
      const r = el.getBoundingClientRect();
      const mid = (r.top + r.bottom) / 2;
      return numbers.find((n) => mid >= n.top && mid <= n.bottom)?.line;
    };
    const collect = (cls) =>
      [...new Set([...editor.querySelectorAll(`.view-overlays .${cls}`)].map(lineAt).filter((l) => l))].sort(
        (a, b) => a - b,
      );
    return {
      error: collect('squiggly-error'),
      warning: collect('squiggly-warning'),
      info: collect('squiggly-info'),
      visible: numbers.map((n) => n.line).filter((l) => Number.isFinite(l)),
    };
  });
}

/** The document text of a one-based line of the first group's editor as drawn, without inlay hints
 * (undefined when the line is not on screen). */
export async function lineText(page, line) {
  return page.evaluate((line) => {
    const editor = document.querySelector('.editor-instance .monaco-editor');
    if (!editor) return undefined;
    const number = [...editor.querySelectorAll('.margin-view-overlays .line-numbers')].find(
      (el) => Number(el.textContent?.trim()) === line,
    );
    if (!number) return undefined;
    const r = number.getBoundingClientRect();
    const mid = (r.top + r.bottom) / 2;
    const view = [...editor.querySelectorAll('.view-lines .view-line')].find((el) => {
      const b = el.getBoundingClientRect();
      return mid >= b.top && mid <= b.bottom;
    });
    if (!view) return undefined;
    // Inlay hints are drawn as spans with a generated rule class beside the token class; only the
    // token spans hold the document's own text.
    const own = [...view.querySelectorAll('span[class]')].filter(
      (el) => /\bmtk\d+\b/.test(el.className) && !/dyn-rule|ced-/.test(el.className),
    );
    return own
      .map((el) => el.textContent)
      .join('')
      .replace(/\u00a0/g, ' ');
  }, line);
}

/** The phase margin in the status bar's design summary, in degrees (undefined when not shown). */
export async function statusBarPm(page) {
  const items = await page.locator('#workbench\\.parts\\.statusbar .statusbar-item').allInnerTexts();
  const m = items.map((t) => t.match(/PM\s*([-−]?\d+(?:\.\d+)?)\s*°/)).find(Boolean);
  return m ? Number(m[1].replace('−', '-')) : undefined;
}

/** Errors, warnings and infos as the status bar's problems item reads them out. */
export async function problemCounts(page) {
  const label = (await page.locator('[id="status.problems"]').first().getAttribute('aria-label')) ?? '';
  const num = (re) => {
    const m = label.match(re);
    return m ? Number(m[1]) : 0;
  };
  return {
    label,
    error: num(/(\d+)\s*error/i) || num(/errors?:\s*(\d+)/i),
    warning: num(/(\d+)\s*warning/i) || num(/warnings?:\s*(\d+)/i),
    info: num(/(\d+)\s*info/i) || num(/infos?:\s*(\d+)/i),
  };
}

/** Polls `probe` until it returns something other than undefined; throws with `what` on timeout. */
export async function poll(what, probe, timeoutMs = 20_000, everyMs = 150) {
  const deadline = Date.now() + timeoutMs;
  let last;
  for (;;) {
    try {
      const v = await probe();
      if (v !== undefined) return v;
    } catch (err) {
      last = err;
    }
    if (Date.now() > deadline) {
      throw new Error(`waited ${timeoutMs / 1000} s for ${what}${last ? `: ${last.message}` : ''}`);
    }
    await new Promise((r) => setTimeout(r, everyMs));
  }
}

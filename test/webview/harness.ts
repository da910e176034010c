// Serves the panel's real page (panelHtml + the bundled panel script + its stylesheet) from a loopback
// server so its Content-Security-Policy applies as in the editor, and drives it in headless Chromium with an
// emulated webview API that records what the page posts to the host.
import { createServer, type Server } from 'node:http';
import { randomBytes } from 'node:crypto';
import { mkdirSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { AddressInfo } from 'node:net';
import * as esbuild from 'esbuild';
import { chromium, type Browser, type Page } from 'playwright-core';
import { panelHtml } from '../../client/src/panelHtml';
import type { PanelData } from '../../shared/src/protocol/panelData';
import type { HostToWebview, WebviewToHost } from '../../shared/src/protocol/webviewMessages';

export const ROOT = resolve(fileURLToPath(new URL('.', import.meta.url)), '..', '..');
export const OUTPUT = join(ROOT, 'test-output', 'webview');

export interface Harness {
  readonly origin: string;
  readonly browser: Browser;
  /** The nonce of the last page served (fresh per load, as in the editor). */
  lastNonce(): string;
  close(): Promise<void>;
}

/** Theme variables as the editor sets them on <html>, and the body class it sets (our own palettes). */
export const THEMES = {
  dark: {
    bodyClass: 'vscode-dark',
    vars: {
      '--vscode-foreground': '#cccccc',
      '--vscode-editor-foreground': '#d4d4d4',
      '--vscode-editor-background': '#1f1f1f',
      '--vscode-descriptionForeground': '#9d9d9d',
      '--vscode-panel-border': '#2b2b2b',
      '--vscode-editorWidget-background': '#202020',
      '--vscode-button-background': '#0078d4',
      '--vscode-button-foreground': '#ffffff',
      '--vscode-button-hoverBackground': '#026ec1',
      '--vscode-button-secondaryBackground': '#313131',
      '--vscode-button-secondaryForeground': '#cccccc',
      '--vscode-charts-foreground': '#cccccc',
      '--vscode-charts-lines': '#cccccc80',
      '--vscode-charts-blue': '#3794ff',
      '--vscode-charts-orange': '#d18616',
      '--vscode-charts-green': '#89d185',
      '--vscode-charts-purple': '#b180d7',
      '--vscode-charts-yellow': '#cca700',
      '--vscode-charts-red': '#f14c4c',
      '--vscode-editorWarning-foreground': '#cca700',
      '--vscode-font-family': 'system-ui, "Liberation Sans", sans-serif',
      '--vscode-font-size': '13px',
      '--vscode-editor-font-family': '"Liberation Mono", monospace',
    },
  },
  light: {
    bodyClass: 'vscode-light',
    vars: {
      '--vscode-foreground': '#3b3b3b',
      '--vscode-editor-foreground': '#3b3b3b',
      '--vscode-editor-background': '#ffffff',
      '--vscode-descriptionForeground': '#717171',
      '--vscode-panel-border': '#e5e5e5',
      '--vscode-editorWidget-background': '#f8f8f8',
      '--vscode-button-background': '#005fb8',
      '--vscode-button-foreground': '#ffffff',
      '--vscode-button-hoverBackground': '#0258a8',
      '--vscode-button-secondaryBackground': '#e5e5e5',
      '--vscode-button-secondaryForeground': '#3b3b3b',
      '--vscode-charts-foreground': '#616161',
      '--vscode-charts-lines': '#61616180',
      '--vscode-charts-blue': '#1a85ff',
      '--vscode-charts-orange': '#c27d1a',
      '--vscode-charts-green': '#388a34',
      '--vscode-charts-purple': '#652d90',
      '--vscode-charts-yellow': '#bf8803',
      '--vscode-charts-red': '#e51400',
      '--vscode-editorWarning-foreground': '#bf8803',
      '--vscode-font-family': 'system-ui, "Liberation Sans", sans-serif',
      '--vscode-font-size': '13px',
      '--vscode-editor-font-family': '"Liberation Mono", monospace',
    },
  },
} as const;
export type ThemeName = keyof typeof THEMES;

export async function startHarness(): Promise<Harness> {
  mkdirSync(OUTPUT, { recursive: true });
  const bundle = join(OUTPUT, 'build', 'panel.js');
  await esbuild.build({
    entryPoints: [join(ROOT, 'client/src/webview/panel.ts')],
    outfile: bundle,
    bundle: true,
    platform: 'browser',
    format: 'iife',
    target: 'es2022',
    logLevel: 'warning',
  });
  const script = readFileSync(bundle);
  const style = readFileSync(join(ROOT, 'client/media/panel.css'));
  let nonce = '';
  let origin = '';
  const server: Server = createServer((req, res) => {
    const path = (req.url ?? '/').split('?')[0];
    if (path === '/') {
      nonce = randomBytes(16).toString('hex');
      const html = panelHtml({
        nonce,
        cspSource: origin,
        scriptUri: `${origin}/media/panel.js`,
        styleUri: `${origin}/media/panel.css`,
      });
      res.writeHead(200, { 'content-type': 'text/html; charset=utf-8' }).end(html);
    } else if (path === '/media/panel.js') {
      res.writeHead(200, { 'content-type': 'text/javascript' }).end(script);
    } else if (path === '/favicon.ico') {
      res.writeHead(204).end();
    } else if (path === '/media/panel.css') {
      res.writeHead(200, { 'content-type': 'text/css' }).end(style);
    } else {
      res.writeHead(404).end();
    }
  });
  await new Promise<void>((ok) => server.listen(0, '127.0.0.1', ok));
  origin = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const browser = await chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-quic',
      '--no-first-run',
      '--disable-sync',
    ],
  });
  return {
    origin,
    browser,
    lastNonce: () => nonce,
    async close() {
      await browser.close();
      await new Promise<void>((ok) => server.close(() => ok()));
    },
  };
}

export interface PanelPage {
  readonly page: Page;
  /** Console errors and CSP violations seen so far. */
  readonly problems: string[];
  readonly dialogs: string[];
  posted(): Promise<WebviewToHost[]>;
  send(message: HostToWebview): Promise<void>;
  /** Sends data and waits until the charts show it. */
  showData(data: PanelData): Promise<void>;
  theme(name: ThemeName): Promise<void>;
}

declare global {
  interface Window {
    __posted: WebviewToHost[];
    __violations: string[];
    __state: unknown;
    __rendered: number;
  }
}

export async function openPanel(h: Harness, viewport = { width: 1280, height: 1100 }): Promise<PanelPage> {
  const page = await h.browser.newPage({ viewport, deviceScaleFactor: 1 });
  const problems: string[] = [];
  const dialogs: string[] = [];
  page.on('console', (m) => {
    if (m.type() === 'error' || /Content Security Policy/i.test(m.text()))
      problems.push(`console: ${m.text()}`);
  });
  page.on('pageerror', (e) => problems.push(`page error: ${e.message}`));
  page.on('dialog', (d) => {
    dialogs.push(d.message());
    void d.dismiss();
  });
  await page.addInitScript(() => {
    window.__posted = [];
    window.__violations = [];
    window.__state = undefined;
    document.addEventListener('securitypolicyviolation', (e) => {
      window.__violations.push(`${e.violatedDirective} blocked ${e.blockedURI}`);
    });
    // The webview API as the editor provides it: one call, postMessage to the host, state across hide/show.
    (window as unknown as { acquireVsCodeApi: () => unknown }).acquireVsCodeApi = () => ({
      postMessage: (m: WebviewToHost) => window.__posted.push(JSON.parse(JSON.stringify(m))),
      getState: () => window.__state,
      setState: (s: unknown) => {
        window.__state = s;
      },
    });
  });
  await page.goto(`${h.origin}/`);
  await page.waitForFunction(() => window.__posted.some((m) => m.type === 'ready'));
  const panel: PanelPage = {
    page,
    problems,
    dialogs,
    posted: () => page.evaluate(() => window.__posted),
    async send(message) {
      await page.evaluate((m) => window.postMessage(m, '*'), message as unknown as Record<string, unknown>);
    },
    async showData(data) {
      await panel.send({ type: 'data', data });
      await page.waitForFunction(
        (d) =>
          (window as unknown as { __ampnoteData?: { design: string; cc?: number; rz?: number } })
            .__ampnoteData?.design === d.design &&
          (window as unknown as { __ampnoteData?: { cc?: number } }).__ampnoteData?.cc === d.cc &&
          (window as unknown as { __ampnoteData?: { rz?: number } }).__ampnoteData?.rz === d.rz &&
          (window as unknown as { __ampnoteCharts?: Record<string, unknown> }).__ampnoteCharts?.splane !==
            undefined,
        { design: data.design, cc: data.cc, rz: data.rz },
      );
    },
    async theme(name) {
      const t = THEMES[name];
      await page.evaluate(
        ({ vars, bodyClass }) => {
          for (const [k, v] of Object.entries(vars)) document.documentElement.style.setProperty(k, v);
          document.body.className = bodyClass;
        },
        { vars: t.vars as Record<string, string>, bodyClass: t.bodyClass },
      );
    },
  };
  await panel.theme('dark');
  return panel;
}

/** What the charts hold, as plain JSON: each dataset's role, label and points. */
export interface DrawnDataset {
  role: string;
  label: string;
  data: {
    x: number;
    y: number;
    cc?: number;
    re?: number;
    im?: number;
    rhp?: boolean;
    pole?: { hz: number };
  }[];
}
export type Drawn = Record<'locus' | 'bode' | 'step' | 'splane', DrawnDataset[]>;

export async function readCharts(page: Page): Promise<Drawn> {
  return page.evaluate(() => {
    const charts = (
      window as unknown as { __ampnoteCharts: Record<string, { data: { datasets: unknown[] } }> }
    ).__ampnoteCharts;
    const out: Record<string, unknown> = {};
    for (const [id, chart] of Object.entries(charts)) {
      out[id] = (chart.data.datasets as { role: string; label: string; data: object[] }[]).map((d) => ({
        role: d.role,
        label: d.label,
        data: d.data.map((p) => JSON.parse(JSON.stringify(p))),
      }));
    }
    return out as Drawn;
  });
}

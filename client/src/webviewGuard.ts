// Messages from the webview are checked before the host acts on them: the page is ours, but what it sends
// carries user input (slider values, exported bytes). Pure, so it is tested without an editor.
import type { ChartId, WebviewToHost } from '../../shared/src/protocol/webviewMessages';

function isNonNegative(v: unknown): v is number {
  return typeof v === 'number' && Number.isFinite(v) && v >= 0;
}

export function isChartId(v: unknown): v is ChartId {
  return v === 'locus' || v === 'bode' || v === 'step' || v === 'splane';
}

export function parseWebviewMessage(raw: unknown): WebviewToHost | undefined {
  if (!raw || typeof raw !== 'object') return undefined;
  const m = raw as Record<string, unknown>;
  const values = () => ({
    cc: isNonNegative(m.cc) && m.cc > 0 ? m.cc : undefined,
    rz: isNonNegative(m.rz) ? m.rz : undefined,
  });
  switch (m.type) {
    case 'ready':
      return { type: 'ready' };
    case 'slider':
      return { type: 'slider', ...values() };
    case 'apply':
      return { type: 'apply', ...values() };
    case 'compensation': {
      const t = m.target as { kind?: unknown; index?: unknown } | null | undefined;
      if (!t || typeof t !== 'object') return undefined;
      if (t.kind !== 'miller' && t.kind !== 'buffered') return undefined;
      if (!Number.isInteger(t.index) || (t.index as number) < 0) return undefined;
      return { type: 'compensation', target: { kind: t.kind, index: t.index as number } };
    }
    case 'exportCsv':
      return isChartId(m.chart) && typeof m.csv === 'string'
        ? { type: 'exportCsv', chart: m.chart, csv: m.csv }
        : undefined;
    case 'exportPng':
      return isChartId(m.chart) &&
        typeof m.dataUrl === 'string' &&
        m.dataUrl.startsWith('data:image/png;base64,')
        ? { type: 'exportPng', chart: m.chart, dataUrl: m.dataUrl }
        : undefined;
    default:
      return undefined;
  }
}

// Messages from the webview are checked before the host acts on them: the page is ours, but what it sends
// carries user input (slider values, exported bytes). Pure, so it is tested without an editor.
import { isChartId } from '../../shared/src/charts/descriptors';
import type { WebviewToHost } from '../../shared/src/protocol/webviewMessages';
import { unwritableValue } from '../../shared/src/writtenValues';

function isNonNegative(v: unknown): v is number {
  return typeof v === 'number' && Number.isFinite(v) && v >= 0;
}

/** Why the panel's values must not be written into the file, or undefined when they may be. */
export function applyRefusal(cc: number | undefined, rz: number | undefined): string | undefined {
  if (cc === undefined && rz === undefined) return 'there is no value to write';
  return (
    (cc !== undefined ? unwritableValue(cc, 'cc') : undefined) ??
    (rz !== undefined ? unwritableValue(rz, 'rz', true) : undefined)
  );
}

/** Free parameters' values: parameter names to numbers (the engine refuses an unusable number with why). */
function freeValuesOf(v: unknown): Record<string, number> | undefined {
  if (!v || typeof v !== 'object' || Array.isArray(v)) return undefined;
  const entries = Object.entries(v as Record<string, unknown>);
  if (entries.length > 1000 || !entries.every(([, x]) => typeof x === 'number')) return undefined;
  return Object.fromEntries(entries) as Record<string, number>;
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
      // Every number is passed on, so that the host can refuse an unusable one with its reason (see
      // applyRefusal) rather than write the other value alone.
      return {
        type: 'apply',
        cc: typeof m.cc === 'number' ? m.cc : undefined,
        rz: typeof m.rz === 'number' ? m.rz : undefined,
      };
    case 'free':
    case 'applyFree': {
      const values = freeValuesOf(m.values);
      return values ? { type: m.type, values } : undefined;
    }
    case 'solve':
      return { type: 'solve' };
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

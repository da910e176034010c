// Chart colours from the editor theme's CSS variables (set by the webview host on <html>), read again
// whenever the theme changes. Fallbacks keep the charts legible when a variable is missing.

export interface ChartColors {
  readonly foreground: string;
  readonly muted: string;
  readonly grid: string;
  readonly background: string;
  /** One colour per pole branch, cycled. */
  readonly series: readonly string[];
  readonly zero: string;
  readonly marker: string;
  readonly band: string;
  readonly fontFamily: string;
  readonly fontSize: number;
}

function cssVar(style: CSSStyleDeclaration, name: string, fallback: string): string {
  const v = style.getPropertyValue(name).trim();
  return v === '' ? fallback : v;
}

export function readThemeColors(el: Element = document.body): ChartColors {
  const style = getComputedStyle(el);
  const dark =
    !document.body.classList.contains('vscode-light') &&
    !document.body.classList.contains('vscode-high-contrast-light');
  const fg = cssVar(style, '--vscode-editor-foreground', dark ? '#cccccc' : '#333333');
  return {
    foreground: cssVar(style, '--vscode-charts-foreground', fg),
    muted: cssVar(style, '--vscode-descriptionForeground', dark ? '#9d9d9d' : '#717171'),
    grid: withAlpha(cssVar(style, '--vscode-charts-lines', dark ? '#8080807f' : '#8080807f'), 0.35),
    background: cssVar(style, '--vscode-editor-background', dark ? '#1e1e1e' : '#ffffff'),
    series: [
      cssVar(style, '--vscode-charts-blue', '#3794ff'),
      cssVar(style, '--vscode-charts-orange', '#d18616'),
      cssVar(style, '--vscode-charts-green', '#89d185'),
      cssVar(style, '--vscode-charts-purple', '#b180d7'),
      cssVar(style, '--vscode-charts-yellow', '#cca700'),
    ],
    zero: cssVar(style, '--vscode-charts-red', '#f14c4c'),
    marker: fg,
    band: cssVar(style, '--vscode-charts-green', '#89d185'),
    fontFamily: cssVar(style, '--vscode-font-family', 'system-ui, sans-serif'),
    fontSize: Number.parseFloat(cssVar(style, '--vscode-font-size', '12')) || 12,
  };
}

/** `#rgb`, `#rrggbb`, `#rrggbbaa` or `rgb(…)`/`rgba(…)` with its alpha replaced. */
export function withAlpha(color: string, alpha: number): string {
  const c = color.trim();
  const hex = /^#([0-9a-f]{3,8})$/i.exec(c);
  if (hex) {
    let h = hex[1]!;
    if (h.length === 3 || h.length === 4) h = [...h].map((d) => d + d).join('');
    const n = (i: number) => Number.parseInt(h.slice(i, i + 2), 16);
    return `rgba(${n(0)}, ${n(2)}, ${n(4)}, ${alpha})`;
  }
  const rgb = /^rgba?\(([^)]+)\)$/i.exec(c);
  if (rgb) {
    const [r, g, b] = rgb[1]!.split(/[\s,/]+/).filter(Boolean);
    return `rgba(${r}, ${g}, ${b}, ${alpha})`;
  }
  return c;
}

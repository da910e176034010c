// Chart colours from the editor theme's CSS variables (set by the webview host on <html>), read again
// whenever the theme changes. Fallbacks keep the charts legible when a variable is missing.
import { withAlpha, type ChartColors } from '../../../shared/src/charts/colors';

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

// The colours a chart is drawn with, chosen by its host: the panel reads them from the editor's theme, the
// report page fixes its own.

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

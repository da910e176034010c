// Collects the language diagnostics of one parse. Every message is reported at most once per range, so that
// evaluating a design again for each corner never repeats what the nominal evaluation already said.
import type { LanguageDiagnostic, SourceRange } from './source';

type Code = LanguageDiagnostic['code'];
type Related = NonNullable<LanguageDiagnostic['related']>;

export class DiagnosticSink {
  private readonly seen = new Set<string>();
  readonly items: LanguageDiagnostic[] = [];

  error(code: Code, message: string, range: SourceRange, related?: Related): void {
    this.add({ code, severity: 'error', message, range, ...(related?.length ? { related } : {}) });
  }

  warning(code: Code, message: string, range: SourceRange, related?: Related): void {
    this.add({ code, severity: 'warning', message, range, ...(related?.length ? { related } : {}) });
  }

  private add(d: LanguageDiagnostic): void {
    const r = d.range;
    const key = `${d.code}|${d.message}|${r.start.line}:${r.start.character}-${r.end.line}:${r.end.character}`;
    if (this.seen.has(key)) return;
    this.seen.add(key);
    this.items.push(d);
  }
}

export const quote = (s: string): string => `\`${s}\``;

// Check thresholds per document (resource scope): read from `ampnote.checks` for that document's URI and
// kept per URI, so one folder's settings never apply to another's. Cleared when the configuration changes.
import type { Connection } from 'vscode-languageserver';
import {
  DEFAULT_CHECK_SETTINGS,
  resolveCheckSettings,
  type CheckSettings,
} from '../../shared/src/checks/settings';

export interface SettingsSource {
  /** The last settings read for `uri` (defaults until the first read finishes). */
  known(uri: string): CheckSettings;
  /** Read the settings for `uri` from the client when it can be asked; the defaults when it cannot. */
  fetch(uri: string): Promise<CheckSettings>;
  forget(uri: string): void;
  clear(): void;
  /** Settings pushed with didChangeConfiguration, used by clients that cannot be asked per document. */
  setPushed(value: unknown): void;
}

export function createSettingsSource(connection: Connection, canAsk: () => boolean): SettingsSource {
  const read = new Map<string, CheckSettings>();
  const pending = new Map<string, Promise<CheckSettings>>();
  let pushed = DEFAULT_CHECK_SETTINGS;
  return {
    known: (uri) => read.get(uri) ?? pushed,
    setPushed(value) {
      const checks = (value as { ampnote?: { checks?: unknown } } | null | undefined)?.ampnote?.checks;
      pushed = resolveCheckSettings(checks);
    },
    fetch(uri) {
      if (!canAsk()) return Promise.resolve(pushed);
      const have = read.get(uri);
      if (have) return Promise.resolve(have);
      const inFlight = pending.get(uri);
      if (inFlight) return inFlight;
      const p = connection.workspace
        .getConfiguration({ scopeUri: uri, section: 'ampnote.checks' })
        .then(
          (value: unknown) => resolveCheckSettings(value),
          () => pushed,
        )
        .then((s) => {
          if (pending.get(uri) === p) {
            read.set(uri, s);
            pending.delete(uri);
          }
          return s;
        });
      pending.set(uri, p);
      return p;
    },
    forget(uri) {
      read.delete(uri);
      pending.delete(uri);
    },
    clear() {
      read.clear();
      pending.clear();
    },
  };
}

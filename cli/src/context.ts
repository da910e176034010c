// What every command receives from main: where it runs, its streams, and the resolved settings.
import type { CheckSettings } from '../../shared/src/checks/settings';
import type { CancelToken } from '../../shared/src/analysis/types';
import type { DocumentReport } from '../../shared/src/report';
import type { Streams } from './io';

export interface CliContext {
  readonly cwd: string;
  readonly streams: Streams;
  readonly version: string;
  /** The installed package's folder (holds docs/ and dist/). */
  readonly packageRoot: string;
  readonly settings: CheckSettings;
  /** The document facade: the same call the language server makes. */
  readonly analyze: (text: string, settings?: Partial<CheckSettings>, token?: CancelToken) => DocumentReport;
}

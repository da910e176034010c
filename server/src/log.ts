// Every handler runs inside `guarded`: an exception is logged with the feature's name and the client gets
// an empty result (unless it is a deliberate ResponseError), so a bad file or bad request never takes the server down.
import { ResponseError, type Connection } from 'vscode-languageserver';

export type Logger = Pick<Connection['console'], 'error' | 'info' | 'log' | 'warn'>;

export function guarded<A extends unknown[], R>(
  log: Logger,
  feature: string,
  fallback: R,
  handler: (...args: A) => R | Promise<R>,
): (...args: A) => Promise<R> {
  return async (...args: A) => {
    try {
      return await handler(...args);
    } catch (error) {
      // A ResponseError is a deliberate answer (e.g. "not a valid name" for rename), not a failure.
      if (error instanceof ResponseError) throw error;
      log.error(`[${feature}] ${error instanceof Error ? (error.stack ?? error.message) : String(error)}`);
      return fallback;
    }
  };
}

// The one way the client's features talk to the server: a typed request that is cancellable and that fails
// with a readable message when the server is not running.
import type * as vscode from 'vscode';

export interface ServerRequests {
  request<P, R>(method: string, params: P, token?: vscode.CancellationToken): Promise<R>;
  readonly isRunning: boolean;
}

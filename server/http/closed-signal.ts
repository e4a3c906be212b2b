/**
 * An AbortSignal that fires when the client gives up a request (the connection closes before the
 * answer is sent), so long work for it (an alpha fit) can be dropped. Its reason is an HttpError
 * (499, as proxies log such requests), which the error handler answers without logging.
 */
import { HttpError } from './errors';

/** What of a response this needs (an Express response has it). */
interface ClosingResponse {
  once(event: 'close', listener: () => void): unknown;
  readonly writableFinished: boolean;
}

export function closedSignal(res: ClosingResponse): AbortSignal {
  const controller = new AbortController();
  res.once('close', () => {
    if (!res.writableFinished) controller.abort(new HttpError(499, 'client_closed', 'The request was given up before its answer.'));
  });
  return controller.signal;
}

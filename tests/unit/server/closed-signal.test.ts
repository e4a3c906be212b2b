import { EventEmitter } from 'node:events';
import { describe, expect, it } from 'vitest';
import { closedSignal } from '../../../server/http/closed-signal';
import { HttpError } from '../../../server/http/errors';

const response = (writableFinished: boolean) => Object.assign(new EventEmitter(), { writableFinished });

describe('the signal of a given-up request', () => {
  it('fires when the connection closes before the answer was sent', () => {
    const res = response(false);
    const signal = closedSignal(res);
    expect(signal.aborted).toBe(false);
    res.emit('close');
    expect(signal.aborted).toBe(true);
    expect(signal.reason).toBeInstanceOf(HttpError);
    expect((signal.reason as HttpError).code).toBe('client_closed');
  });

  it('stays quiet when the answer was sent', () => {
    const res = response(true);
    const signal = closedSignal(res);
    res.emit('close');
    expect(signal.aborted).toBe(false);
  });
});

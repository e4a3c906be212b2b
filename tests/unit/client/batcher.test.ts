import { describe, expect, it, vi } from 'vitest';
import { ApiError } from '@/api';
import { BATCH_LIMIT, CommandBatcher, type Batch } from '@/drive/batcher';
import type { BatchResult, DriveState } from '@shared/sim';

/** A fake server: applies batches in seq order, answers resends with the stored answer, like server/services/attempts.ts. */
function fakeServer(opts: { callPointAt?: number } = {}) {
  let nextSeq = 0;
  const stored = new Map<number, { commands: string; result: BatchResult }>();
  const applied: { v: number; w: number }[] = [];
  const state = (seq: number, status: DriveState['status'] = 'driving'): DriveState => ({
    status,
    seq,
    time: seq * 0.1,
    odometry: { x: seq, y: 0, theta: 0 },
    v: 0,
    w: 0,
    pendingCallPointId: null,
    answeredCallPoints: [],
    markersInView: [],
    docked: false,
    contacts: 0,
    blocked: false,
    distanceSinceAnchor: 0,
  });
  function handle(batch: Batch): BatchResult {
    const key = JSON.stringify(batch.commands);
    if (batch.fromSeq < nextSeq) {
      const earlier = stored.get(batch.fromSeq);
      if (earlier && earlier.commands === key) return earlier.result;
      throw new ApiError(409, 'seq_conflict', 'conflict', {}, { code: 'seq_conflict', message: 'conflict', expectedSeq: nextSeq });
    }
    if (batch.fromSeq > nextSeq) {
      throw new ApiError(409, 'seq_conflict', 'gap', {}, { code: 'seq_conflict', message: 'gap', expectedSeq: nextSeq });
    }
    const odometry = [];
    let status: DriveState['status'] = 'driving';
    for (const command of batch.commands) {
      applied.push(command);
      nextSeq += 1;
      odometry.push({ x: nextSeq, y: 0, theta: 0 });
      if (opts.callPointAt !== undefined && nextSeq === opts.callPointAt) {
        status = 'awaiting_call';
        break;
      }
    }
    const result: BatchResult = { seq: nextSeq, odometry, events: [], state: state(nextSeq, status) };
    stored.set(batch.fromSeq, { commands: key, result });
    return result;
  }
  return { handle, applied, get seq() { return nextSeq; } };
}

const flush = () => new Promise((resolve) => setTimeout(resolve, 0));
const networkDown = () => new ApiError(0, 'network_error', 'offline');

function setup(opts: { callPointAt?: number; sendInterval?: number } = {}) {
  const server = fakeServer(opts);
  const sent: Batch[] = [];
  const results: { result: BatchResult; dropped: number }[] = [];
  const links: string[] = [];
  let failNext = 0;
  /** Lose the answer after the server applied it (the request got through, the response did not). */
  let loseAnswers = 0;
  const timers: { fn: () => void; ms: number }[] = [];
  let clock = 0;
  const batcher = new CommandBatcher(0, {
    send: async (batch) => {
      sent.push({ fromSeq: batch.fromSeq, commands: batch.commands.map((c) => ({ ...c })) });
      if (failNext > 0) {
        failNext -= 1;
        throw networkDown();
      }
      const result = server.handle(batch);
      if (loseAnswers > 0) {
        loseAnswers -= 1;
        throw networkDown();
      }
      return result;
    },
    onResult: (result, _batch, dropped) => results.push({ result, dropped }),
    onLinkChange: (state) => links.push(state),
    sendInterval: opts.sendInterval ?? 0,
    now: () => clock,
    setTimer: (fn, ms) => {
      const t = { fn, ms };
      timers.push(t);
      return t;
    },
    clearTimer: (handle) => {
      const i = timers.indexOf(handle as (typeof timers)[number]);
      if (i >= 0) timers.splice(i, 1);
    },
  });
  async function runTimers() {
    await flush();
    while (timers.length > 0) {
      const t = timers.shift()!;
      clock += t.ms;
      t.fn();
      await flush();
    }
  }
  return {
    server,
    batcher,
    sent,
    results,
    links,
    runTimers,
    failNext: (n: number) => (failNext = n),
    loseAnswers: (n: number) => (loseAnswers = n),
    advance: (ms: number) => (clock += ms),
  };
}

describe('CommandBatcher', () => {
  it('numbers batches by seq and sends one at a time, queuing what comes meanwhile', async () => {
    const t = setup();
    t.batcher.push({ v: 1, w: 0 });
    t.batcher.push({ v: 1, w: 0.1 });
    t.batcher.push({ v: 1, w: 0.2 });
    await flush();
    await t.runTimers();
    expect(t.sent).toEqual([
      { fromSeq: 0, commands: [{ v: 1, w: 0 }] },
      { fromSeq: 1, commands: [{ v: 1, w: 0.1 }, { v: 1, w: 0.2 }] },
    ]);
    expect(t.batcher.seq).toBe(3);
    expect(t.server.applied).toHaveLength(3);
    expect(t.batcher.stats).toMatchObject({ queued: 3, acknowledged: 3, dropped: 0 });
  });

  it('waits the send interval between batches, so one batch carries several control periods', async () => {
    const t = setup({ sendInterval: 200 });
    t.batcher.push({ v: 1, w: 0 });
    await flush();
    t.batcher.push({ v: 0.5, w: 0 });
    t.batcher.push({ v: 0.2, w: 0 });
    await flush();
    expect(t.sent).toHaveLength(1);
    await t.runTimers();
    expect(t.sent).toHaveLength(2);
    expect(t.sent[1]).toEqual({ fromSeq: 1, commands: [{ v: 0.5, w: 0 }, { v: 0.2, w: 0 }] });
  });

  it(`never puts more than ${BATCH_LIMIT} commands in a batch`, async () => {
    const t = setup({ sendInterval: 200 });
    t.batcher.push({ v: 1, w: 0 });
    for (let i = 0; i < 120; i++) t.batcher.push({ v: 1, w: 0 });
    await t.runTimers();
    expect(t.sent.map((b) => b.commands.length)).toEqual([1, 50, 50, 20]);
    expect(t.server.seq).toBe(121);
  });

  it('resends the same batch after a network failure until it is acknowledged, and reports the link', async () => {
    const t = setup();
    t.failNext(3);
    t.batcher.push({ v: 1, w: 0 });
    await flush();
    expect(t.batcher.link).toBe('lost');
    // Commands taken meanwhile wait behind the batch being resent.
    t.batcher.push({ v: 0.4, w: 0 });
    await t.runTimers();
    expect(t.sent.map((b) => b.fromSeq)).toEqual([0, 0, 0, 0, 1]);
    expect(new Set(t.sent.slice(0, 4).map((b) => JSON.stringify(b)))).toEqual(new Set([JSON.stringify({ fromSeq: 0, commands: [{ v: 1, w: 0 }] })]));
    expect(t.links).toEqual(['lost', 'ok']);
    expect(t.server.applied).toEqual([{ v: 1, w: 0 }, { v: 0.4, w: 0 }]);
    expect(t.batcher.stats.resends).toBe(3);
  });

  it('survives an answer lost after the server applied the batch: the resend gets the stored answer, nothing is applied twice', async () => {
    const t = setup();
    t.loseAnswers(1);
    t.batcher.push({ v: 1, w: 0 });
    await flush();
    t.batcher.push({ v: 0.8, w: 0 });
    await t.runTimers();
    expect(t.server.applied).toEqual([{ v: 1, w: 0 }, { v: 0.8, w: 0 }]);
    expect(t.results.map((r) => r.result.seq)).toEqual([1, 2]);
    expect(t.batcher.seq).toBe(2);
  });

  it('backs off between retries, up to a cap', async () => {
    const delays: number[] = [];
    const batcher = new CommandBatcher(0, {
      send: () => Promise.reject(networkDown()),
      onResult: () => undefined,
      setTimer: (_fn, ms) => {
        delays.push(ms);
        return ms;
      },
      clearTimer: () => undefined,
    });
    batcher.push({ v: 1, w: 0 });
    await flush();
    for (let i = 0; i < 7; i++) {
      batcher.retryNow();
      await flush();
    }
    expect(delays).toEqual([250, 500, 1000, 2000, 4000, 4000, 4000, 4000]);
    batcher.stop();
  });

  it('drops the rest of a batch and the queue when a call point stops the robot, and holds until released', async () => {
    const t = setup({ callPointAt: 2 });
    t.batcher.push({ v: 1, w: 0 });
    await flush();
    t.batcher.push({ v: 1, w: 0 });
    t.batcher.push({ v: 1, w: 0 });
    t.batcher.push({ v: 1, w: 0 });
    await t.runTimers();
    expect(t.server.seq).toBe(2);
    expect(t.results[1].dropped).toBe(2);
    expect(t.batcher.stats).toMatchObject({ queued: 4, acknowledged: 2, dropped: 2 });
    // Held: nothing goes out while the call is due.
    t.batcher.push({ v: 1, w: 0 });
    await t.runTimers();
    expect(t.sent).toHaveLength(2);
    // After the call, the console resets to the server's seq and releases the hold.
    expect(t.batcher.reset(2)).toBe(1);
    t.batcher.hold(false);
    t.batcher.push({ v: 0.5, w: 0 });
    await t.runTimers();
    expect(t.sent.at(-1)).toEqual({ fromSeq: 2, commands: [{ v: 0.5, w: 0 }] });
    expect(t.server.seq).toBe(3);
  });

  it('turns every unsent command into a stop on an emergency stop and sends at once', async () => {
    const t = setup({ sendInterval: 1000 });
    t.batcher.push({ v: 1, w: 0.2 });
    await flush();
    t.batcher.push({ v: 1, w: 0.2 });
    t.batcher.push({ v: 1, w: 0.2 });
    expect(t.sent).toHaveLength(1);
    t.batcher.emergencyStop();
    await flush();
    expect(t.sent).toHaveLength(2);
    expect(t.sent[1]).toEqual({ fromSeq: 1, commands: [{ v: 0, w: 0 }, { v: 0, w: 0 }, { v: 0, w: 0 }] });
    expect(t.server.seq).toBe(4);
  });

  it('asks the console to reload the drive on a seq conflict, with the expected seq', async () => {
    const onResync = vi.fn();
    const batcher = new CommandBatcher(5, {
      send: () => Promise.reject(new ApiError(409, 'seq_conflict', 'gap', {}, { code: 'seq_conflict', message: 'gap', expectedSeq: 3 })),
      onResult: () => undefined,
      onResync,
    });
    batcher.push({ v: 1, w: 0 });
    await flush();
    expect(onResync).toHaveBeenCalledWith('seq_conflict', 3);
    expect(batcher.busy).toBe(false);
  });

  it('stops on an error retrying cannot fix', async () => {
    const onFatal = vi.fn();
    const send = vi.fn(() => Promise.reject(new ApiError(400, 'validation_failed', 'bad')));
    const batcher = new CommandBatcher(0, { send, onResult: () => undefined, onFatal });
    batcher.push({ v: 1, w: 0 });
    await flush();
    batcher.push({ v: 1, w: 0 });
    await flush();
    expect(onFatal).toHaveBeenCalledOnce();
    expect(send).toHaveBeenCalledOnce();
  });
});

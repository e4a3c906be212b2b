import { describe, expect, it } from 'vitest';
import { ControlClock } from '@/drive/control-clock';

function setup(maxCatchUp?: number) {
  let now = 1000;
  let samples = 0;
  const clock = new ControlClock({
    period: 0.1,
    sample: () => (samples += 1),
    maxCatchUp,
    now: () => now,
    setInterval: () => 1,
    clearInterval: () => undefined,
  });
  return {
    clock,
    at: (ms: number) => {
      now = 1000 + ms;
      clock.tick();
    },
    samples: () => samples,
  };
}

describe('ControlClock', () => {
  it('takes one command at start and one per control period after, whatever the timer jitter', () => {
    const t = setup();
    t.clock.start();
    expect(t.samples()).toBe(1);
    t.at(40);
    t.at(99);
    expect(t.samples()).toBe(1);
    t.at(100);
    expect(t.samples()).toBe(2);
    for (const ms of [160, 260, 330, 395, 520, 610, 700, 815, 850, 990, 1000]) t.at(ms);
    expect(t.samples()).toBe(11);
  });

  it('catches up at most a few periods after a stall and lets the rest go', () => {
    const t = setup(3);
    t.clock.start();
    t.at(2000); // 20 periods late
    expect(t.samples()).toBe(4);
    t.at(2100);
    expect(t.samples()).toBe(5);
  });

  it('takes nothing while stopped, and restarts its count when started again', () => {
    const t = setup();
    t.clock.start();
    t.clock.stop();
    t.at(5000);
    expect(t.samples()).toBe(1);
    t.clock.start();
    expect(t.samples()).toBe(2);
    t.at(5100);
    expect(t.samples()).toBe(3);
  });
});

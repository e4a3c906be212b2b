import { describe, expect, it } from 'vitest';
import type { DriveSim } from '../../../shared/sim';
import { createDriveCache } from '../../../server/services/drive-cache';

const sim = {} as DriveSim;
const tick = () => new Promise((resolve) => setTimeout(resolve, 5));

describe('the drive cache', () => {
  it('runs the work on one attempt one piece after another, even when one fails', async () => {
    const drives = createDriveCache();
    const events: string[] = [];
    const work = (name: string, fail = false) => async () => {
      events.push(`${name} starts`);
      await tick();
      events.push(`${name} ends`);
      if (fail) throw new Error(name);
      return name;
    };
    const results = await Promise.allSettled([drives.exclusive('a', work('first')), drives.exclusive('a', work('second', true)), drives.exclusive('a', work('third'))]);
    expect(events).toEqual(['first starts', 'first ends', 'second starts', 'second ends', 'third starts', 'third ends']);
    expect(results.map((r) => r.status)).toEqual(['fulfilled', 'rejected', 'fulfilled']);
  });

  it('lets work on different attempts overlap', async () => {
    const drives = createDriveCache();
    const events: string[] = [];
    const work = (name: string) => async () => {
      events.push(`${name} starts`);
      await tick();
      events.push(`${name} ends`);
    };
    await Promise.all([drives.exclusive('a', work('a')), drives.exclusive('b', work('b'))]);
    expect(events.slice(0, 2)).toEqual(['a starts', 'b starts']);
  });

  it('keeps the drives used last and forgets the oldest past its limit', () => {
    const drives = createDriveCache(2);
    drives.set('a', { logLength: 1, userId: 1, sim });
    drives.set('b', { logLength: 1, userId: 1, sim });
    drives.get('a');
    drives.set('c', { logLength: 1, userId: 1, sim });
    expect(drives.get('a')).toBeDefined();
    expect(drives.get('b')).toBeUndefined();
    expect(drives.get('c')).toBeDefined();
  });
});

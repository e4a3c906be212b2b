/**
 * The drives a web process holds in memory: a small least-recently-used map from attempt id to
 * the rebuilt drive, how much of the stored log it reflects, and whose drive it is. It is only a
 * cache (the log in PostgreSQL is the truth), but a drive must not be changed by two requests at
 * once, so every change to an attempt runs inside `exclusive(attemptId, …)`, one after another.
 */
import type { DriveSim } from '../../shared/sim';

export interface CachedDrive {
  logLength: number;
  userId: number;
  sim: DriveSim;
}

export interface DriveCache {
  get(attemptId: string): CachedDrive | undefined;
  set(attemptId: string, entry: CachedDrive): void;
  delete(attemptId: string): void;
  /** Runs `work` after every earlier piece of work on the same attempt in this process has ended. */
  exclusive<T>(attemptId: string, work: () => Promise<T>): Promise<T>;
}

export function createDriveCache(limit = 500): DriveCache {
  const map = new Map<string, CachedDrive>();
  const tails = new Map<string, Promise<unknown>>();
  return {
    get(id) {
      const entry = map.get(id);
      if (entry) {
        map.delete(id);
        map.set(id, entry);
      }
      return entry;
    },
    set(id, entry) {
      map.delete(id);
      map.set(id, entry);
      if (map.size > limit) map.delete(map.keys().next().value!);
    },
    delete: (id) => void map.delete(id),
    exclusive(id, work) {
      const run = (tails.get(id) ?? Promise.resolve()).then(work);
      const tail = run.then(
        () => undefined,
        () => undefined,
      );
      tails.set(id, tail);
      void tail.then(() => {
        if (tails.get(id) === tail) tails.delete(id);
      });
      return run;
    },
  };
}

/**
 * One calibration upload of the new-profile page: the chosen file (kept for the save), its
 * preview answer or row problems, and a way to send it again (e.g. after the robot changed).
 * Only the newest request counts: an older answer that arrives late is dropped.
 */
import { computed, shallowRef } from 'vue';
import type { FleetFileKind } from '@shared/schemas';
import { checkCalibrationFile, uploadFailure, type UploadStep } from './fleet-form';

export function useCalibrationUpload<T>(kind: FleetFileKind, send: (file: File) => Promise<T>, fallback: string) {
  const file = shallowRef<File | null>(null);
  // Replaced whole on every change, so a shallow ref is enough (and keeps T unwrapped).
  const state = shallowRef<UploadStep<T>>({ step: 'idle' });
  let generation = 0;

  function setState(next: UploadStep<T>) {
    state.value = next;
  }

  async function run(): Promise<void> {
    const current = file.value;
    if (!current) return;
    const mine = ++generation;
    setState({ step: 'checking', fileName: current.name });
    try {
      const result = await send(current);
      if (mine === generation) setState({ step: 'done', fileName: current.name, result });
    } catch (error) {
      if (mine === generation) setState(uploadFailure<T>(current.name, error, fallback));
    }
  }

  /** Checks the file locally, then sends it unless `hold` (e.g. the robot is not chosen yet). */
  function choose(chosen: File, hold = false): void {
    const problem = checkCalibrationFile(chosen, kind);
    if (problem) {
      generation++;
      file.value = null;
      setState({ step: 'failed', fileName: chosen.name, message: problem });
      return;
    }
    file.value = chosen;
    if (hold) {
      generation++;
      setState({ step: 'idle' });
      return;
    }
    void run();
  }

  function clear(): void {
    generation++;
    file.value = null;
    setState({ step: 'idle' });
  }

  const step = computed(() => state.value.step);
  const result = computed(() => (state.value.step === 'done' ? state.value.result : null));
  /** A file is chosen but not usable yet (being read, refused, or waiting to be sent). */
  const blocking = computed(() => file.value !== null && step.value !== 'done');

  return { file, state, step, result, blocking, choose, clear, run };
}

/**
 * Loads an attempt report, waiting politely while the scoring job runs (the API answers 409
 * `scoring` until then): it asks again every second, then every few seconds.
 */
import { onBeforeUnmount, ref, shallowRef, watch, type Ref } from 'vue';
import type { AttemptReport } from '@shared/schemas';
import { errorMessage, isApiError, reportsApi } from '@/api';

export type ReportPhase = 'loading' | 'scoring' | 'ready' | 'not_submitted' | 'failed';

export function useAttemptReport(attemptId: Ref<string>) {
  const report = shallowRef<AttemptReport | null>(null);
  const phase = ref<ReportPhase>('loading');
  const failure = ref<string | null>(null);
  /** Times the report was asked for while scoring. */
  const waits = ref(0);
  let timer: ReturnType<typeof setTimeout> | undefined;
  let controller: AbortController | null = null;

  function stop() {
    if (timer !== undefined) clearTimeout(timer);
    timer = undefined;
    controller?.abort();
    controller = null;
  }

  async function load(quiet = false) {
    stop();
    const current = new AbortController();
    controller = current;
    if (!quiet) phase.value = report.value ? phase.value : 'loading';
    failure.value = null;
    try {
      const next = await reportsApi.get(attemptId.value, current.signal);
      if (current.signal.aborted) return;
      report.value = next;
      phase.value = 'ready';
    } catch (error) {
      if (error instanceof DOMException && error.name === 'AbortError') return;
      if (isApiError(error) && error.code === 'scoring') {
        phase.value = 'scoring';
        waits.value += 1;
        timer = setTimeout(() => void load(true), waits.value < 20 ? 1000 : 4000);
        return;
      }
      if (isApiError(error) && error.code === 'not_submitted') {
        phase.value = 'not_submitted';
        failure.value = error.message;
        return;
      }
      phase.value = 'failed';
      failure.value = errorMessage(error);
    }
  }

  watch(attemptId, () => {
    report.value = null;
    waits.value = 0;
    void load();
  });
  onBeforeUnmount(stop);

  return { report, phase, failure, waits, load, reload: () => load(true) };
}

/** What the employer pages share: the signed-in employer's organization, and the levels (loaded once). */
import { computed, onMounted, ref } from 'vue';
import type { PublicLevel } from '@shared/schemas';
import { errorMessage, trialsApi } from '@/api';
import { useSessionStore } from '@/stores/session';

/** The organization of the signed-in employer (null for anyone without one). */
export function useEmployerOrganization() {
  const session = useSessionStore();
  const orgId = computed(() => session.user?.organizationId ?? null);
  const organizationName = computed(() => session.user?.organizationName ?? '');
  const emailConfirmed = computed(() => session.user?.emailConfirmed ?? false);
  return { orgId, organizationName, emailConfirmed };
}

let levelsPromise: Promise<PublicLevel[]> | null = null;

/** The levels, in their order; fetched once per page load, again after a failure. */
export function loadLevels(): Promise<PublicLevel[]> {
  if (!levelsPromise) {
    levelsPromise = trialsApi
      .levels()
      .then(({ items }) => [...items].sort((a, b) => a.order - b.order))
      .catch((error: unknown) => {
        levelsPromise = null;
        throw error;
      });
  }
  return levelsPromise;
}

export function useLevels() {
  const levels = ref<PublicLevel[]>([]);
  const loading = ref(true);
  const failure = ref<string | null>(null);

  function load() {
    loading.value = true;
    failure.value = null;
    loadLevels()
      .then((items) => {
        levels.value = items;
      })
      .catch((error: unknown) => {
        failure.value = errorMessage(error);
      })
      .finally(() => {
        loading.value = false;
      });
  }

  onMounted(load);

  function levelName(id: string): string {
    return levels.value.find((l) => l.id === id)?.name ?? id;
  }

  return { levels, loading, failure, load, levelName };
}

import { defineStore } from 'pinia';
import { ref } from 'vue';
import type { Organization } from '@shared/schemas';
import { organizationsApi } from '@/api';

/** The organizations an administrator can put accounts in (loaded once, on demand). */
export const useOrganizationsStore = defineStore('organizations', () => {
  const items = ref<Organization[]>([]);
  const loaded = ref(false);
  const loading = ref(false);
  let pending: Promise<void> | null = null;

  function load(force = false): Promise<void> {
    if (loaded.value && !force) return Promise.resolve();
    if (!pending) {
      loading.value = true;
      pending = organizationsApi
        .list()
        .then(({ items: list }) => {
          items.value = [...list].sort((a, b) => a.name.localeCompare(b.name));
          loaded.value = true;
        })
        .finally(() => {
          loading.value = false;
          pending = null;
        });
    }
    return pending;
  }

  return { items, loaded, loading, load };
});

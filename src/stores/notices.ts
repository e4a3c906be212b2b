import { defineStore } from 'pinia';
import { ref } from 'vue';

export interface Notice {
  severity: 'success' | 'info' | 'warn' | 'error';
  summary: string;
  detail?: string;
}

/**
 * Short notices raised outside components (the router guard), shown as toasts by App.vue.
 * Kept here until the app is mounted, so a notice from the very first navigation is not lost.
 */
export const useNoticesStore = defineStore('notices', () => {
  const pending = ref<Notice[]>([]);

  function push(notice: Notice): void {
    pending.value.push(notice);
  }

  function take(): Notice[] {
    const taken = pending.value;
    pending.value = [];
    return taken;
  }

  return { pending, push, take };
});

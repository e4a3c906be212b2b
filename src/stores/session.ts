import { defineStore } from 'pinia';
import { computed, ref } from 'vue';
import type { PublicUser, Role, SignIn } from '@shared/schemas';
import { authApi, isApiError } from '@/api';
import { roleHome } from '@/navigation';

export const useSessionStore = defineStore('session', () => {
  const user = ref<PublicUser | null>(null);
  /** True once we know whether someone is signed in (GET /api/auth/me answered). */
  const loaded = ref(false);
  let pending: Promise<void> | null = null;

  const signedIn = computed(() => user.value !== null);
  const home = computed(() => (user.value ? roleHome(user.value.role) : '/sign-in'));

  /** Asks the server who is signed in, once; later calls reuse the answer. */
  function load(): Promise<void> {
    if (loaded.value) return Promise.resolve();
    if (!pending) {
      pending = authApi
        .me()
        .then(({ user: current }) => {
          user.value = current;
        })
        .catch((error: unknown) => {
          // 401 means nobody is signed in. Anything else (server down) is treated the same
          // way: the sign-in page then shows the real error when the person tries.
          if (!isApiError(error)) throw error;
          user.value = null;
        })
        .finally(() => {
          loaded.value = true;
          pending = null;
        });
    }
    return pending;
  }

  async function signIn(credentials: SignIn): Promise<PublicUser> {
    const { user: current } = await authApi.signIn(credentials);
    user.value = current;
    loaded.value = true;
    return current;
  }

  async function signOut(): Promise<void> {
    try {
      await authApi.signOut();
    } finally {
      clear();
    }
  }

  /** Forget the user locally (the server already ended the session). */
  function clear(): void {
    user.value = null;
    loaded.value = true;
  }

  function hasRole(...roles: Role[]): boolean {
    return user.value !== null && roles.includes(user.value.role);
  }

  return { user, loaded, signedIn, home, load, signIn, signOut, clear, hasRole };
});

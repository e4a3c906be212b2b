import { createApp } from 'vue';
import { createPinia } from 'pinia';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import ConfirmationService from 'primevue/confirmationservice';

import '@fontsource/lato/latin-400.css';
import '@fontsource/lato/latin-700.css';
import 'primeicons/primeicons.css';
import './styles/main.css';

import App from './App.vue';
import { onUnauthenticated } from './api';
import { createAppRouter } from './router';
import { useNoticesStore } from './stores/notices';
import { useSessionStore } from './stores/session';
import { themeConfig } from './theme';

const app = createApp(App);
const pinia = createPinia();
app.use(pinia);
app.use(PrimeVue, { theme: themeConfig, ripple: false });
app.use(ToastService);
app.use(ConfirmationService);

const router = createAppRouter({
  notify: (message) => useNoticesStore(pinia).push({ severity: 'info', summary: message }),
});
app.use(router);

// The session ended while the app was open (expired, or the account was deactivated):
// forget the user and ask them to sign in again, coming back to the same page afterwards.
onUnauthenticated(() => {
  const session = useSessionStore(pinia);
  if (!session.user) return;
  session.clear();
  const current = router.currentRoute.value;
  if (!current.meta.public) {
    void router.replace({ name: 'sign-in', query: { redirect: current.fullPath, ended: '1' } });
  }
});

router
  .isReady()
  .catch((error: unknown) => {
    console.error('Driftproof could not open the first page', error);
  })
  .finally(() => app.mount('#app'));

import { createApp } from 'vue';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import ConfirmationService from 'primevue/confirmationservice';
import '@fontsource/open-sans/400.css';
import '@fontsource/open-sans/600.css';
import '@fontsource/open-sans/700.css';
import 'primeicons/primeicons.css';
import './styles/main.css';
import App from './App.vue';
import { createAppRouter } from './router';
import { BrimstockPreset } from './theme/preset';
import { onUnauthenticated } from './api/http';
import { useSessionStore } from './stores/session';
import { createAppPinia } from './stores/plugins/forgetOnUserChange';

const app = createApp(App);
// With the plugin that empties a person's stores when someone else signs in on the device.
const pinia = createAppPinia();
app.use(pinia);
const router = createAppRouter();
app.use(router);
app.use(PrimeVue, {
  theme: {
    preset: BrimstockPreset,
    // One light scheme for now, tuned for daylight screens; a dark scheme would need its own checks.
    options: { darkModeSelector: false, cssLayer: false },
  },
});
app.use(ToastService);
app.use(ConfirmationService);

// A session that ended on the server (deactivated, expired) sends the person to sign in again.
onUnauthenticated(() => {
  const session = useSessionStore(pinia);
  if (!session.user) return;
  session.clear();
  const current = router.currentRoute.value;
  if (!current.meta.public) void router.replace({ name: 'sign-in', query: { redirect: current.fullPath } });
});

app.mount('#app');

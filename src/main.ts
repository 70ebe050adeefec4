/// <reference types="vite-plugin-pwa/vanillajs" />
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
import { useRoundStore } from './stores/round';
import { useRoundOutboxStore } from './stores/round-outbox';
import { registerSW } from 'virtual:pwa-register';
import { offerUpdate } from './offline/app-update';
import { i18n } from './i18n';
import { primeVueLanguage } from './i18n/primevue-locales';

const app = createApp(App);
// With the plugin that empties a person's stores when someone else signs in on the device.
const pinia = createAppPinia();
app.use(pinia);
const router = createAppRouter();
app.use(router);
app.use(i18n);
app.use(PrimeVue, {
  theme: {
    preset: BrimstockPreset,
    // One light scheme for now, tuned for daylight screens; a dark scheme would need its own checks.
    options: { darkModeSelector: false, cssLayer: false },
  },
});
// PrimeVue's own words (Yes/No, month names, aria labels) follow the screens' language.
app.use(primeVueLanguage);
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

// Rounds waiting on this device go out from app start (the round store writes the answers into its drafts).
useRoundStore(pinia);
useRoundOutboxStore(pinia).start();

// The service worker keeps the app for use without signal; a new version waits for the person to choose to reload.
const updateSW = registerSW({
  onNeedRefresh: () => offerUpdate(() => updateSW(true)),
  onRegisteredSW: (_url, registration) => {
    if (registration) setInterval(() => void registration.update().catch(() => undefined), 60 * 60_000);
  },
});

app.mount('#app');

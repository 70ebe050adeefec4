import { createApp } from 'vue';
import type { Pinia } from 'pinia';
import { createAppPinia } from '@/stores/plugins/forgetOnUserChange';

/** The app's Pinia with its plugins, installed in a bare app (Pinia applies plugins only once installed). */
export function appPinia(): Pinia {
  const pinia = createAppPinia();
  createApp({}).use(pinia);
  return pinia;
}

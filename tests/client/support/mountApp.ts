import { afterEach } from 'vitest';
import { DOMWrapper, enableAutoUnmount, mount, flushPromises } from '@vue/test-utils';
import { defineComponent, h, type Component } from 'vue';
import { createMemoryHistory, type Router } from 'vue-router';
import type { Pinia } from 'pinia';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import ConfirmationService from 'primevue/confirmationservice';
import ConfirmDialog from 'primevue/confirmdialog';
import Toast from 'primevue/toast';
import { createAppRouter } from '@/router';

// Dialogs listen on PrimeVue's global event buses: a test's app must be gone before the next mounts.
enableAutoUnmount(afterEach);

/**
 * Mounts a component with PrimeVue (unstyled), the given Pinia and the app's router at `path`,
 * beside a ConfirmDialog and Toast as App.vue has them.
 */
export async function mountWithApp(component: Component, options: { pinia: Pinia; path?: string; router?: Router; props?: Record<string, unknown> }) {
  const router = options.router ?? createAppRouter(createMemoryHistory());
  await router.push(options.path ?? '/');
  await router.isReady();
  const host = defineComponent({ render: () => h('div', [h(component, options.props ?? {}), h(ConfirmDialog), h(Toast)]) });
  const wrapper = mount(host, {
    attachTo: document.body,
    global: {
      plugins: [options.pinia, router, [PrimeVue, { unstyled: true }], ToastService, ConfirmationService],
    },
  });
  await flushPromises();
  return { wrapper, router };
}

/** A wrapper for an element anywhere in the document (dialogs and drawers are teleported to <body>). */
export function inDocument(testId: string): DOMWrapper<HTMLElement> {
  const element = document.querySelector<HTMLElement>(`[data-testid="${testId}"]`);
  if (!element) throw new Error(`No element with data-testid="${testId}" in the document`);
  return new DOMWrapper(element);
}

/** Whether an element with this test id is anywhere in the document. */
export function existsInDocument(testId: string): boolean {
  return document.querySelector(`[data-testid="${testId}"]`) !== null;
}

/** Resizes happy-dom's window, which is what matchMedia answers from. */
export function setViewportWidth(width: number): void {
  (window as unknown as { happyDOM: { setViewport(v: { width: number; height: number }): void } }).happyDOM.setViewport({ width, height: 800 });
}

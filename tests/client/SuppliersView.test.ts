import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import * as authApi from '@/api/auth';
import * as inventoryApi from '@/api/inventory';
import { setLanguage } from '@/i18n';
import SuppliersView from '@/views/SuppliersView.vue';
import { englishLeft } from './support/englishLeft';
import { makeUser, sessionOf } from './support/fixtures';
import { makeSupplier } from './support/inventoryFixtures';
import { inDocument, mountWithApp } from './support/mountApp';

vi.mock('@/api/auth', () => ({ fetchSession: vi.fn(), signIn: vi.fn(), signOut: vi.fn(), updateProfile: vi.fn(), setPassword: vi.fn(), requestPasswordReset: vi.fn(), fetchTokenInfo: vi.fn() }));
vi.mock('@/api/inventory', () => ({ fetchSuppliers: vi.fn(), createSupplier: vi.fn(), updateSupplier: vi.fn() }));

const auth = vi.mocked(authApi);
const api = vi.mocked(inventoryApi);
let pinia: Pinia;

// Two invented suppliers, one archived.
const seaweed = makeSupplier(1, { name: 'Kelpmoor Supplies', leadTimeDays: 6, notes: 'Delivers Tuesdays' });
const old = makeSupplier(2, { name: 'Brackenfield Agri', archivedAt: '2026-01-05T00:00:00.000Z' });

/** The confirm dialog's button with this label (the card beside it has one of the same name). */
const dialogButton = (label: string) => [...document.querySelectorAll('[role="alertdialog"] button')].find((b) => b.textContent?.trim() === label) as HTMLButtonElement | undefined;
const toastText = () => document.querySelector('[data-pc-name="toast"]')?.textContent ?? '';

beforeEach(() => {
  vi.clearAllMocks();
  document.body.innerHTML = '';
  pinia = createPinia();
  setActivePinia(pinia);
  api.fetchSuppliers.mockResolvedValue([seaweed, old]);
});
afterEach(() => setLanguage('en'));

describe('SuppliersView', () => {
  it('lists the active suppliers with their lead time, and the archived ones once asked', async () => {
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('buyer')));
    const { wrapper } = await mountWithApp(SuppliersView, { pinia, path: '/suppliers' });

    expect(wrapper.get('h1').text()).toBe('Suppliers');
    expect(wrapper.get('[data-testid="supplier-1"]').text()).toContain('Lead time');
    expect(wrapper.get('[data-testid="supplier-1"]').text()).toContain('6 days');
    expect(wrapper.find('[data-testid="supplier-2"]').exists()).toBe(false);

    await wrapper.get('[data-testid="suppliers-show-archived"] input').setValue(true);
    expect(wrapper.get('[data-testid="supplier-2"]').text()).toContain('Archived');
  });

  it('speaks Spanish to a Spanish-speaking buyer, in the list, the archive question and its toast', async () => {
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('buyer', { language: 'es' })));
    api.updateSupplier.mockResolvedValue({ ...seaweed, archivedAt: '2026-03-02T10:00:00.000Z' });
    const { wrapper } = await mountWithApp(SuppliersView, { pinia, path: '/suppliers' });

    expect(wrapper.get('h1').text()).toBe('Proveedores');
    const card = wrapper.get('[data-testid="supplier-1"]');
    expect(card.findAll('dt').map((dt) => dt.text())).toEqual(['Contacto', 'Correo electrónico', 'Teléfono', 'Plazo de entrega', 'Notas']);
    expect(wrapper.get('[data-testid="supplier-archive-1"]').text()).toBe('Archivar');
    expect(englishLeft(wrapper.text(), ['suppliers'])).toEqual([]);

    await wrapper.get('[data-testid="supplier-archive-1"]').trigger('click');
    await flushPromises();
    expect(document.body.textContent).toContain('¿Archivar Kelpmoor Supplies?');
    expect(document.body.textContent).toContain('Deja de aparecer en las listas para insumos nuevos.');
    dialogButton('Archivar')!.click();
    await flushPromises();
    expect(api.updateSupplier).toHaveBeenCalledWith(1, { archived: true });
    expect(toastText()).toContain('Proveedor archivado');
  });

  it('opens the editor in French with the lead time in days and the form words of the area', async () => {
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('buyer', { language: 'fr' })));
    const { wrapper } = await mountWithApp(SuppliersView, { pinia, path: '/suppliers' });

    await wrapper.get('[data-testid="supplier-edit-1"]').trigger('click');
    await flushPromises();
    const dialog = inDocument('supplier-dialog');
    expect(dialog.text()).toContain('Modifier Kelpmoor Supplies');
    expect(dialog.text()).toContain('Délai de livraison par défaut');
    expect((document.querySelector('[data-testid="supplier-lead-time"] input') as HTMLInputElement).value).toBe('6 jours');
    expect(englishLeft(dialog.text(), ['suppliers'])).toEqual([]);
  });
});

import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, defineStore, setActivePinia } from 'pinia';
import { createApp, ref } from 'vue';
import { useBoardStore } from '@/stores/board';
import { useBrewsStore } from '@/stores/brews';
import { useFarmsStore } from '@/stores/farms';
import { useFlagsStore } from '@/stores/flags';
import { useImportsStore } from '@/stores/imports';
import { useInventoryStore } from '@/stores/inventory';
import { usePeopleStore } from '@/stores/people';
import { forgetOnUserChange, PERSONAL_STORES } from '@/stores/plugins/forgetOnUserChange';
import { useSessionStore } from '@/stores/session';
import { useTanksStore } from '@/stores/tanks';
import { appPinia } from './support/appPinia';
import { makeFarm, makePerson, makeUser } from './support/fixtures';
import { makeInput, makeOrder, makeSupplier } from './support/inventoryFixtures';
import { makeBoard, makeFarmBoard, makeWaterTank } from './support/tanks';

vi.mock('@/api/auth', () => ({ fetchSession: vi.fn(), signIn: vi.fn(), signOut: vi.fn(), updateProfile: vi.fn(), setPassword: vi.fn(), requestPasswordReset: vi.fn(), fetchTokenInfo: vi.fn() }));

beforeEach(() => {
  setActivePinia(appPinia());
});

/** Every personal store, holding what the manager (user 2) loaded. */
function filledByManager() {
  const session = useSessionStore();
  session.user = makeUser('manager');
  const farms = useFarmsStore();
  farms.farms = [makeFarm(11, 'Creek site')];
  farms.status = 'ready';
  const people = usePeopleStore();
  people.people = [makePerson(5, 'Ana Reyes', 'worker')];
  people.status = 'ready';
  const tanks = useTanksStore();
  tanks.tanks = [makeWaterTank()];
  const inventory = useInventoryStore();
  inventory.suppliers = [makeSupplier(21)];
  inventory.inputs = [makeInput(41)];
  inventory.orders = [makeOrder(9)];
  inventory.inputsStatus = 'ready';
  const board = useBoardStore();
  board.applyBoard(makeBoard([makeFarmBoard(11, 'Creek site', [])]));
  const flags = useFlagsStore();
  flags.status = 'ready';
  const brews = useBrewsStore();
  brews.status = 'ready';
  const imports = useImportsStore();
  imports.farmId = 11;
  return { session, farms, people, tanks, inventory, board, flags, brews, imports };
}

function expectAllEmpty(stores: ReturnType<typeof filledByManager>): void {
  expect(stores.farms.farms).toEqual([]);
  expect(stores.farms.status).toBe('idle');
  expect(stores.people.people).toEqual([]);
  expect(stores.tanks.tanks).toEqual([]);
  expect([stores.inventory.suppliers, stores.inventory.inputs, stores.inventory.orders]).toEqual([[], [], []]);
  expect(stores.inventory.inputsStatus).toBe('idle');
  expect(stores.board.farms).toEqual([]);
  expect(stores.board.generatedAt).toBeNull();
  expect(stores.flags.status).toBe('idle');
  expect(stores.brews.status).toBe('idle');
  expect(stores.imports.farmId).toBeNull();
}

describe('forgetOnUserChange (Pinia plugin)', () => {
  it('empties every personal store when another person signs in on the device', () => {
    const stores = filledByManager();
    stores.session.user = makeUser('worker');
    expectAllEmpty(stores);
  });

  it('empties them on signing out too', () => {
    const stores = filledByManager();
    stores.session.user = null;
    expectAllEmpty(stores);
  });

  it('keeps them while the same person stays signed in (a fresh copy of their own user record)', () => {
    const stores = filledByManager();
    stores.session.user = makeUser('manager', { name: 'Dana O.' });
    expect(stores.farms.farms).toHaveLength(1);
    expect(stores.inventory.inputs).toHaveLength(1);
    expect(stores.board.farms).toHaveLength(1);
    expect(stores.imports.farmId).toBe(11);
  });

  it('lists exactly the stores that keep a person’s data', () => {
    expect([...PERSONAL_STORES].sort()).toEqual(['board', 'brews', 'farms', 'flags', 'imports', 'inventory', 'people', 'tanks']);
  });

  it('refuses a personal store that has no reset, so one cannot be added and forgotten', () => {
    const pinia = createPinia();
    pinia.use(forgetOnUserChange);
    createApp({}).use(pinia);
    setActivePinia(pinia);
    const useBroken = defineStore('people', () => ({ people: ref([]) }));
    expect(() => useBroken()).toThrow("The people store keeps a person's data but has no reset()");
  });
});

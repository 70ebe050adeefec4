import { beforeEach, describe, expect, it, vi } from 'vitest';
import { DOMWrapper, flushPromises } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import { capacityL, validateGeometry } from '@shared/calibration';
import type { Role, TankCreateInput, UnitSystem } from '@shared/schemas';
import { cautionText } from '@shared/cautions';
import { formatVolume } from '@shared/units';
import * as authApi from '@/api/auth';
import * as tanksApi from '@/api/tanks';
import { ApiError } from '@/api/http';
import TankEditorDialog from '@/components/tank/TankEditorDialog.vue';
import { makeUser, sessionOf } from './support/fixtures';
import { existsInDocument, inDocument, mountWithApp } from './support/mountApp';
import { makeTank } from './support/tankFixtures';

vi.mock('@/api/auth', () => ({ fetchSession: vi.fn(), signIn: vi.fn(), signOut: vi.fn(), updateProfile: vi.fn(), setPassword: vi.fn(), requestPasswordReset: vi.fn(), fetchTokenInfo: vi.fn() }));
vi.mock('@/api/tanks', () => ({
  fetchTanks: vi.fn(),
  fetchTank: vi.fn(),
  createTank: vi.fn(),
  updateTank: vi.fn(),
  fetchContentsHistory: vi.fn(),
  fetchCalibration: vi.fn(),
  calibrationCsvUrl: vi.fn(),
  gaugeStripUrl: vi.fn(),
}));
vi.mock('@/api/board', () => ({ fetchBoard: vi.fn(), fetchBoardHistory: vi.fn() }));
vi.mock('@/api/farms', () => ({ fetchFarms: vi.fn(), fetchFarm: vi.fn(), createFarm: vi.fn(), updateFarm: vi.fn() }));

const auth = vi.mocked(authApi);
const api = vi.mocked(tanksApi);
let pinia: Pinia;

// Exact definitions: 1 in = 25.4 mm; 1 US gallon = 231 in³ = 3.785411784 L
// (NIST Handbook 44, Appendix C, General Tables of Units of Measurement).
const MM_PER_IN = 25.4;
const L_PER_USGAL = 3.785411784;

beforeEach(() => {
  vi.clearAllMocks();
  document.body.innerHTML = '';
  pinia = createPinia();
  setActivePinia(pinia);
});

async function openEditor(options: { system?: UnitSystem; role?: Role; tank?: ReturnType<typeof makeTank> | null } = {}) {
  auth.fetchSession.mockResolvedValue(sessionOf(makeUser(options.role ?? 'manager', { unitSystem: options.system ?? 'metric' })));
  return mountWithApp(TankEditorDialog, { pinia, path: '/profile', props: { visible: true, tank: options.tank ?? null, farmId: 11 } });
}

function input(id: string): DOMWrapper<HTMLInputElement> {
  const element = document.getElementById(id) as HTMLInputElement | null;
  if (!element) throw new Error(`No input #${id}`);
  return new DOMWrapper(element);
}

/** Types into a PrimeVue InputNumber: it takes the typed text as its value when the input loses focus. */
async function typeNumber(id: string, value: number): Promise<void> {
  const field = input(id);
  await field.setValue(String(value));
  await field.trigger('blur');
  await flushPromises();
}

/** Picks a kind of contents by its label. */
async function chooseContents(label: string): Promise<void> {
  const option = [...document.querySelectorAll<HTMLElement>('[data-testid="tank-contents"] [role="radio"], [data-testid="tank-contents"] button')].find((b) => b.textContent?.trim() === label);
  if (!option) throw new Error(`No contents option ${label}`);
  option.click();
  await flushPromises();
}

async function submit(): Promise<void> {
  await inDocument('tank-submit').trigger('submit');
  await flushPromises();
}

function sent(): TankCreateInput {
  expect(api.createTank).toHaveBeenCalledTimes(1);
  return api.createTank.mock.calls[0]![0];
}

describe('TankEditorDialog', () => {
  it('converts sizes typed in inches and a threshold in US gallons to mm and litres before sending', async () => {
    api.createTank.mockImplementation(async (body) => makeTank(21, { ...body }));
    await openEditor({ system: 'us' });

    await input('tank-name').setValue('Shed rain tank');
    await input('tank-code').setValue('CK-21');
    await typeNumber('tank-size-diameterMm', 100);
    await typeNumber('tank-size-heightMm', 60);
    await typeNumber('tank-datum', 2.5);
    await typeNumber('tank-outlet', 3);
    await typeNumber('tank-low-stock', 50);
    await submit();

    const body = sent();
    expect(body.geometry.shape).toBe('vertical-cylinder');
    const g = body.geometry as { diameterMm: number; heightMm: number };
    expect(g.diameterMm).toBeCloseTo(100 * MM_PER_IN, 9);
    expect(g.heightMm).toBeCloseTo(60 * MM_PER_IN, 9);
    expect(body.datumOffsetMm).toBeCloseTo(2.5 * MM_PER_IN, 9);
    expect(body.outletHeightMm).toBeCloseTo(3 * MM_PER_IN, 9);
    expect(body.lowStockL).toBeCloseTo(50 * L_PER_USGAL, 9);
    expect(body.safeFillLevelMm).toBeUndefined();
    expect(body).toMatchObject({ farmId: 11, name: 'Shed rain tank', code: 'CK-21', contents: 'water', specificGravity: 1, sensorHeightMm: null });
  });

  it('shows the capacity in gallons as the sizes are typed', async () => {
    await openEditor({ system: 'us' });
    expect(inDocument('tank-capacity').text()).toContain('Enter every size');

    await typeNumber('tank-size-diameterMm', 48);
    await typeNumber('tank-size-heightMm', 72);

    const expected = formatVolume(capacityL({ shape: 'vertical-cylinder', diameterMm: 48 * MM_PER_IN, heightMm: 72 * MM_PER_IN }), 'us');
    expect(expected).toMatch(/ gal$/);
    expect(inDocument('tank-capacity-value').text()).toBe(expected);
  });

  it('names the size field at fault and sends nothing when a size is missing', async () => {
    await openEditor();

    await input('tank-name').setValue('Header tank');
    await input('tank-code').setValue('CK-2');
    await typeNumber('tank-size-diameterMm', 1600);
    await submit();

    expect(api.createTank).not.toHaveBeenCalled();
    expect(inDocument('tank-size-heightMm-error').text()).toBe('is required');
    expect(existsInDocument('tank-size-diameterMm-error')).toBe(false);
  });

  it('shows the shared schema’s message under the fill-and-mark row whose level falls', async () => {
    await openEditor();
    await input('tank-name').setValue('Barrel culture');
    await input('tank-code').setValue('CK-3');
    await new DOMWrapper(document.querySelector<HTMLInputElement>('input[name="tank-shape"][value="points"]')!).setValue(true);
    await flushPromises();

    await typeNumber('tank-point-level-1', 100);
    await typeNumber('tank-point-volume-1', 20);
    await typeNumber('tank-point-level-2', 80);
    await typeNumber('tank-point-volume-2', 30);

    const checked = validateGeometry({ shape: 'points', points: [{ levelMm: 0, volumeL: 0 }, { levelMm: 100, volumeL: 20 }, { levelMm: 80, volumeL: 30 }] });
    expect(checked.ok).toBe(false);
    const issue = checked.ok ? undefined : checked.issues.find((i) => i.field === 'points.2');
    expect(issue).toBeDefined();
    const message = issue!.message.replace('points.2: ', '');
    expect(inDocument('tank-point-error-2').text()).toBe(message);
    expect(existsInDocument('tank-point-error-1')).toBe(false);

    await submit();
    expect(api.createTank).not.toHaveBeenCalled();
    expect(inDocument('tank-point-error-2').text()).toBe(message);
  });

  it('puts a point error the server names (geometry.points.1) under that row', async () => {
    api.createTank.mockRejectedValue(new ApiError(400, 'invalid_input', 'geometry.points.1: volume 20 L is not above the previous point’s 20 L', 'geometry.points.1'));
    await openEditor();
    await input('tank-name').setValue('Barrel culture');
    await input('tank-code').setValue('CK-3');
    await new DOMWrapper(document.querySelector<HTMLInputElement>('input[name="tank-shape"][value="points"]')!).setValue(true);
    await flushPromises();
    await typeNumber('tank-point-level-1', 100);
    await typeNumber('tank-point-volume-1', 20);
    await typeNumber('tank-point-level-2', 200);
    await typeNumber('tank-point-volume-2', 45);
    await submit();

    expect(api.createTank).toHaveBeenCalledTimes(1);
    expect(inDocument('tank-point-error-1').text()).toBe('volume 20 L is not above the previous point’s 20 L');
  });

  it('shows a code already used on the farm under the code field', async () => {
    api.createTank.mockRejectedValue(new ApiError(409, 'code_taken', 'code: another tank on this farm already uses the code CK-1', 'code'));
    await openEditor();
    await input('tank-name').setValue('Second tank');
    await input('tank-code').setValue('CK-1');
    await typeNumber('tank-size-diameterMm', 1000);
    await typeNumber('tank-size-heightMm', 1200);
    await submit();

    expect(inDocument('tank-code-error').text()).toBe('another tank on this farm already uses the code CK-1');
  });

  it('sends only the changed name when a tank stored in mm is edited in inches', async () => {
    // 3,200 mm is 125.984… in: shown rounded, it must not come back as a changed diameter.
    const tank = makeTank(5, { geometry: { shape: 'horizontal-cylinder', diameterMm: 3200, lengthMm: 3800, ends: 'ellipsoidal-2to1' }, datumOffsetMm: -30, outletHeightMm: 100 });
    api.updateTank.mockResolvedValue({ ...tank, name: 'Flats header' });
    await openEditor({ system: 'us', tank });

    await input('tank-size-diameterMm').trigger('focus');
    await input('tank-size-diameterMm').trigger('blur');
    await input('tank-name').setValue('Flats header');
    await submit();

    expect(api.updateTank).toHaveBeenCalledWith(5, { name: 'Flats header' });
  });

  it('shows the confined-space caution always and the electrical one for culture tanks, in the shared caution words', async () => {
    await openEditor();
    expect(inDocument('tank-caution-confined').text()).toBe(cautionText('confined-space'));
    expect(existsInDocument('tank-caution-rcd')).toBe(false);

    await chooseContents('Culture');
    expect(inDocument('tank-caution-rcd').text()).toBe(cautionText('electrical'));
    expect(existsInDocument('tank-caution-backflow')).toBe(false);
  });

  it('shows the backflow caution for fertilizer and adds the protective-equipment one for pest solution', async () => {
    await openEditor();
    await chooseContents('Fertilizer');
    expect(inDocument('tank-caution-backflow').text()).toBe(cautionText('backflow'));
    expect(existsInDocument('tank-caution-ppe')).toBe(false);
    await chooseContents('Pest solution');
    expect(inDocument('tank-caution-backflow').text()).toBe(cautionText('backflow'));
    expect(inDocument('tank-caution-ppe').text()).toBe(cautionText('pest-solution'));
  });

  it.each([
    [-30, '30 mm below the floor'],
    [45, '45 mm above the floor'],
    [0, 'at the floor'],
  ])('words a datum offset of %s mm as the zero mark %s while it is typed', async (offset, words) => {
    await openEditor();
    await typeNumber('tank-datum', offset);
    expect(inDocument('tank-datum-words').text()).toBe(`The zero mark is ${words}.`);
  });
});

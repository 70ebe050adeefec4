import { beforeEach, describe, expect, it, vi } from 'vitest';
import { DOMWrapper, flushPromises } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import type { Reading, TankCalibrationVersion } from '@shared/schemas';
import { formatVolume } from '@shared/units';
import * as authApi from '@/api/auth';
import TankCorrectionDialog from '@/components/tank/TankCorrectionDialog.vue';
import { makeUser, sessionOf } from './support/fixtures';
import { existsInDocument, inDocument, mountWithApp } from './support/mountApp';
import { makeWaterTank } from './support/tanks';

vi.mock('@/api/auth', () => ({ fetchSession: vi.fn(), signIn: vi.fn(), signOut: vi.fn(), updateProfile: vi.fn(), setPassword: vi.fn(), requestPasswordReset: vi.fn(), fetchTokenInfo: vi.fn() }));

let pinia: Pinia;
beforeEach(() => {
  document.body.innerHTML = '';
  pinia = createPinia();
  setActivePinia(pinia);
  vi.mocked(authApi).fetchSession.mockResolvedValue(sessionOf(makeUser('worker')));
});

// The tank today: a 3.2 m wide cylinder whose tube zero mark was moved to 60 mm above the floor
// (version 2). The reading was taken under version 1, when the zero mark sat at the floor.
const TANK = makeWaterTank();
const FIRST: TankCalibrationVersion = { number: 1, key: 'a1b2c3d4', createdAt: '2025-11-20T02:00:00.000Z', current: false, geometry: TANK.geometry, datumOffsetMm: 0 };
const READING: Reading = {
  id: 7, tankId: TANK.id, takenAt: '2025-12-01T19:00:00.000Z', levelMm: 480, grossL: 3_860.4, usableL: 2_654, temperatureC: null, source: 'round', enteredBy: 'Ana',
  importId: null, note: '', calibrationVersion: FIRST.key, correctedById: null, correctsId: null,
};

async function open(props: { reading?: Reading; calibration?: TankCalibrationVersion | null }) {
  await mountWithApp(TankCorrectionDialog, {
    pinia,
    path: '/profile',
    props: { visible: true, tank: TANK, reading: props.reading ?? READING, system: 'metric', timeZone: 'Pacific/Auckland', save: vi.fn(), ...('calibration' in props ? { calibration: props.calibration } : {}) },
  });
}

async function typeReading(mm: number): Promise<void> {
  const field = new DOMWrapper(document.getElementById('correction-reading') as HTMLInputElement);
  await field.setValue(String(mm));
  await field.trigger('blur');
  await flushPromises();
}

/** π/4 · 3.2² m² · h: litres in the 3.2 m cylinder at a level of h mm (hand derivation, V = πr²h). */
const litresAt = (levelMm: number) => (Math.PI / 4) * 3.2 * 3.2 * levelMm;

describe('TankCorrectionDialog preview', () => {
  it('works the litres out with the reading’s own calibration, as the server stores them', async () => {
    await open({ calibration: FIRST });
    await typeReading(500);
    // Under version 1 the tube's 500 mm is the level 500 mm; today's zero mark would make it 560 mm.
    const preview = inDocument('correction-preview').text();
    expect(preview).toContain('Level 500 mm');
    expect(preview).toContain(formatVolume(litresAt(500), 'metric'));
    expect(preview).not.toContain('560 mm');
    expect(inDocument('correction-older-calibration').text()).toContain('Version 1 · ');
  });

  it('uses the current calibration for a reading taken under it', async () => {
    await open({ reading: { ...READING, calibrationVersion: TANK.calibrationVersion }, calibration: null });
    await typeReading(500);
    expect(inDocument('correction-preview').text()).toContain('Level 560 mm');
    expect(existsInDocument('correction-older-calibration')).toBe(false);
  });

  it('waits for the reading’s calibration instead of previewing with another one', async () => {
    await open({});
    await typeReading(500);
    expect(existsInDocument('correction-preview')).toBe(false);
    expect(inDocument('correction-preview-pending').text()).toContain('once this reading’s calibration has loaded');
  });

  it('falls back to the current calibration when the tank has no record of the reading’s, as the server does', async () => {
    await open({ calibration: null });
    await typeReading(500);
    expect(inDocument('correction-preview').text()).toContain('Level 560 mm');
  });
});

import { describe, expect, it } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import SelectButton from 'primevue/selectbutton';
import { cautionText } from '@shared/cautions';
import { concentrateVolume, describeRatio, dosingRate, injectionRatio, mixFromRatio, topUpPlan } from '@shared/mixing';
import type { BrewKind, UnitSystem } from '@shared/schemas';
import { formatVolume, toSI } from '@shared/units';
import BrewsMixingCalculator from '@/components/brews/BrewsMixingCalculator.vue';

function mountCalculator(props: { unitSystem?: UnitSystem; kind?: BrewKind; tankFill?: { grossL: number; ullageL: number } | null } = {}) {
  return mount(BrewsMixingCalculator, {
    props: { unitSystem: props.unitSystem ?? 'metric', kind: props.kind ?? 'fertilizer', tankFill: props.tankFill ?? null },
    global: { plugins: [[PrimeVue, { unstyled: true }]] },
  });
}

async function chooseMode(wrapper: ReturnType<typeof mountCalculator>, mode: string) {
  // The first SelectButton is the mode switch.
  wrapper.findAllComponents(SelectButton)[0]!.vm.$emit('update:modelValue', mode);
  await flushPromises();
}

async function type(wrapper: ReturnType<typeof mountCalculator>, testId: string, value: number) {
  await wrapper.find(`[data-testid="${testId}"]`).setValue(String(value));
}

describe('BrewsMixingCalculator', () => {
  it.each([100, 50, 4.5, 1])('shows both readings of the ratio 1 : %s as describeRatio words them, before any convention is chosen', async (n) => {
    const wrapper = mountCalculator();
    await type(wrapper, 'mix-n', n);
    const expected = describeRatio(n);
    expect(wrapper.find('[data-testid="mix-reading-water"]').text()).toBe(expected.partsWater);
    expect(wrapper.find('[data-testid="mix-reading-total"]').text()).toBe(expected.partsTotal);
    expect(wrapper.find('[data-testid="mix-choose-convention"]').exists()).toBe(true);
    expect(wrapper.find('[data-testid="mix-result"]').exists()).toBe(false);
  });

  it.each([
    ['parts-water', 'mix-conv-water'],
    ['parts-total', 'mix-conv-total'],
  ] as const)('splits the total with mixFromRatio(…, %s) once that convention is chosen, and hands those litres over', async (convention, radioId) => {
    const wrapper = mountCalculator();
    await type(wrapper, 'mix-n', 20);
    await type(wrapper, 'mix-total', 500);
    await wrapper.find(`#${radioId}`).setValue(true);
    const expected = mixFromRatio(500, 20, convention);
    expect(wrapper.find('[data-testid="mix-concentrate"]').text()).toBe(formatVolume(expected.concentrate, 'metric', 2));
    expect(wrapper.find('[data-testid="mix-water"]').text()).toBe(formatVolume(expected.water, 'metric', 2));
    await wrapper.find('[data-testid="mix-use"]').trigger('click');
    expect(wrapper.emitted('apply')![0]![0]).toEqual({ concentrateL: expected.concentrate, waterL: expected.water, dilution: { n: 20, convention } });
  });

  it('converts US gallons typed for the total to litres before calling mixFromRatio', async () => {
    const wrapper = mountCalculator({ unitSystem: 'us' });
    await type(wrapper, 'mix-n', 10);
    await type(wrapper, 'mix-total', 50);
    await wrapper.find('#mix-conv-water').setValue(true);
    await wrapper.find('[data-testid="mix-use"]').trigger('click');
    const expected = mixFromRatio(toSI(50, 'usgal'), 10, 'parts-water');
    expect(wrapper.emitted('apply')![0]![0]).toMatchObject({ concentrateL: expected.concentrate, waterL: expected.water });
  });

  it('works out the concentrate by concentrateVolume in strength mode', async () => {
    const wrapper = mountCalculator();
    await chooseMode(wrapper, 'strength');
    await type(wrapper, 'mix-c1', 12);
    await type(wrapper, 'mix-c2', 0.8);
    await type(wrapper, 'mix-v2', 300);
    const concentrate = concentrateVolume(12, 0.8, 300);
    expect(wrapper.find('[data-testid="mix-concentrate"]').text()).toBe(formatVolume(concentrate, 'metric', 2));
    expect(wrapper.find('[data-testid="mix-water"]').text()).toBe(formatVolume(300 - concentrate, 'metric', 2));
  });

  it('plans a top-up with topUpPlan, starting from the tank volume of its latest reading', async () => {
    const wrapper = mountCalculator({ tankFill: { grossL: 200, ullageL: 500 } });
    await chooseMode(wrapper, 'topup');
    expect((wrapper.find('[data-testid="mix-v0"]').element as HTMLInputElement).value).toBe('200');
    await type(wrapper, 'mix-c0', 1);
    await type(wrapper, 'mix-vt', 600);
    await type(wrapper, 'mix-ct', 2);
    await type(wrapper, 'mix-cs', 25);
    const plan = topUpPlan({ currentVolume: 200, currentStrength: 1, targetVolume: 600, targetStrength: 2, stockStrength: 25, ullageL: 500 });
    if (!plan.ok) throw new Error('the case must be a workable top-up');
    expect(wrapper.find('[data-testid="mix-concentrate"]').text()).toBe(formatVolume(plan.concentrate, 'metric', 2));
    expect(wrapper.find('[data-testid="mix-water"]').text()).toBe(formatVolume(plan.water, 'metric', 2));
  });

  it('shows topUpPlan\'s refusal reason and offers no amounts when the top-up would pass the safe fill line', async () => {
    const wrapper = mountCalculator({ tankFill: { grossL: 400, ullageL: 150 } });
    await chooseMode(wrapper, 'topup');
    await type(wrapper, 'mix-c0', 0);
    await type(wrapper, 'mix-vt', 800);
    await type(wrapper, 'mix-ct', 1);
    await type(wrapper, 'mix-cs', 10);
    const plan = topUpPlan({ currentVolume: 400, currentStrength: 0, targetVolume: 800, targetStrength: 1, stockStrength: 10, ullageL: 150 });
    expect(plan.ok).toBe(false);
    expect(wrapper.find('[data-testid="mix-topup-refusal"]').text()).toBe(plan.ok ? '' : plan.reason);
    expect(wrapper.find('[data-testid="mix-use"]').exists()).toBe(false);
  });

  it('states the injection ratio and dosing rate from injectionRatio and dosingRate, with the backflow caution', async () => {
    const wrapper = mountCalculator();
    await chooseMode(wrapper, 'injection');
    await type(wrapper, 'mix-inj-target', 0.5);
    await type(wrapper, 'mix-inj-stock', 50);
    await type(wrapper, 'mix-flow', 40);
    const ratio = injectionRatio({ concentrateStrength: 50, targetStrength: 0.5 });
    expect(wrapper.find('[data-testid="mix-injection-result"]').text()).toContain(`1 part concentrate per ${ratio} parts of irrigation water`);
    expect(wrapper.find('[data-testid="mix-dosing-rate"]').text()).toContain(`Draws ${dosingRate({ flowLPerMin: 40, ratio })} L`);
    expect(wrapper.find('[data-testid="caution-backflow"]').text()).toContain('backflow preventer');
  });

  it.each([
    ['pest-solution', 'caution-pest', 'pest-solution', 'protective equipment'],
    ['culture', 'caution-heater', 'electrical', 'residual-current'],
  ] as const)('shows the caution for a %s brew in the shared words', (kind, testId, topic, words) => {
    const wrapper = mountCalculator({ kind });
    const caution = wrapper.get(`[data-testid="${testId}"]`).text();
    expect(caution).toContain(words);
    expect(caution).toBe(cautionText(topic));
  });

  it('ends the heater caution with a whole sentence that defers to the local electrical code', () => {
    const wrapper = mountCalculator({ kind: 'culture' });
    const sentences = wrapper.get('[data-testid="caution-heater"]').text().split(/(?<=\.)\s+/);
    expect(sentences.at(-1)).toBe('A licensed electrician should install it to your local electrical code.');
  });
});

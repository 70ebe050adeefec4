// The mixing calculator's figures and what the shared mixing code makes of them, one outcome per
// mode (dilution ratio, strength, top-up, injection). Each outcome is null until every figure it needs
// is typed, a message in the person's language naming the first figure the shared code would refuse,
// or the result. BrewsMixingCalculator.vue lays them out.
import { computed, ref, watch, type Ref } from 'vue';
import { useI18n } from 'vue-i18n';
import { concentrateVolume, dosingRate, injectionRatio, mixFromRatio, topUpPlan, type RatioConvention, type TopUpInput } from '@shared/mixing';
import { displayUnits, formatNumberTrimmed, fromSI, toSI, UNIT_SYMBOLS, type UnitSystem } from '@shared/units';
import { topUpRefusalText } from './brewLabels';

/** The strength units the calculator offers (all its strengths in one unit, so they compare). */
export const STRENGTH_UNITS = ['%', 'g/L', 'ml/L'] as const;
export type StrengthUnit = (typeof STRENGTH_UNITS)[number];

export interface MixCalculationsOptions {
  unitSystem: () => UnitSystem;
  /** The chosen tank's latest gross volume and ullage to the safe fill line (L); null when unknown. */
  tankFill: () => { grossL: number; ullageL: number } | null;
  strengthUnit: Ref<StrengthUnit>;
}

/** A typed figure (an emptied number input gives '' or null). */
export const num = (v: number | null | string): v is number => typeof v === 'number' && Number.isFinite(v);

type Outcome<T> = { ok: true; value: T } | { ok: false; message: string } | null;

/** The calculator's figures, in the person's volume unit, and each mode's outcome. */
export function useMixCalculations(options: MixCalculationsOptions) {
  const { t } = useI18n();
  const volumeUnit = computed(() => displayUnits(options.unitSystem()).volume);
  const volumeSymbol = computed(() => UNIT_SYMBOLS[volumeUnit.value]);
  const toL = (v: number) => toSI(v, volumeUnit.value);

  // Ratio
  const ratioN = ref<number | null>(null);
  const convention = ref<RatioConvention | null>(null);
  const ratioTotal = ref<number | null>(null);
  // Strength
  const stockStrength = ref<number | null>(null);
  const finalStrength = ref<number | null>(null);
  const finalVolume = ref<number | null>(null);
  // Top-up
  const currentVolume = ref<number | null>(null);
  const currentStrength = ref<number | null>(0);
  const targetVolume = ref<number | null>(null);
  const targetStrength = ref<number | null>(null);
  const topStockStrength = ref<number | null>(null);
  const typedUllage = ref<number | null>(null);
  // Injection
  const injTarget = ref<number | null>(null);
  const injStock = ref<number | null>(null);
  const flow = ref<number | null>(null);

  // The tank's latest reading pre-fills what it holds; the person may still correct it.
  watch(
    () => options.tankFill(),
    (fill) => {
      currentVolume.value = fill ? Number(fromSI(fill.grossL, volumeUnit.value).toFixed(2)) : null;
    },
    { immediate: true },
  );

  /**
   * Runs a shared computation once every figure is typed. `problem` names, in the person's language, the first
   * figure the computation would refuse (the shared checks word their errors for developers, in English).
   */
  function attempt<T>(ready: boolean, problem: () => string | null, run: () => T): Outcome<T> {
    if (!ready) return null;
    const message = problem();
    if (message) return { ok: false, message };
    try {
      return { ok: true, value: run() };
    } catch {
      return { ok: false, message: t('brews.mix.errors.cannotWorkOut') };
    }
  }
  const field = (key: string) => t(`brews.mix.fields.${key}`);
  const mustBePositive = (checks: [value: number | null, key: string][]) => {
    const bad = checks.find(([value]) => !((value as number) > 0));
    return bad ? t('brews.mix.errors.positive', { field: field(bad[1]) }) : null;
  };
  const mustNotBeNegative = (checks: [value: number | null, key: string][]) => {
    const bad = checks.find(([value]) => (value as number) < 0);
    return bad ? t('brews.mix.errors.notNegative', { field: field(bad[1]) }) : null;
  };

  // Both plain-language readings of "1 : N", worded as describeRatio (shared/mixing) words them in English.
  const parts = (x: number) => formatNumberTrimmed(x, 3);
  const waterParts = (x: number) => t('brews.mix.waterParts', { n: parts(x) }, x === 1 ? 1 : 2);
  const readings = computed(() =>
    attempt(
      num(ratioN.value),
      () => ((ratioN.value as number) > 0 ? null : t('brews.mix.errors.nPositive')),
      () => {
        const n = ratioN.value as number;
        const partsTotal = n < 1 ? null : n === 1 ? t('brews.mix.concentrateOnly') : t('brews.mix.readingTotal', { total: parts(n), water: waterParts(n - 1) });
        return { partsWater: t('brews.mix.readingWater', { water: waterParts(n), total: parts(n + 1) }), partsTotal };
      },
    ),
  );
  const ratioMix = computed(() =>
    attempt(
      num(ratioN.value) && num(ratioTotal.value) && convention.value !== null,
      () => {
        if ((ratioTotal.value as number) < 0) return t('brews.mix.errors.totalNegative');
        if ((ratioN.value as number) < 0) return t('brews.mix.errors.nPositive');
        return convention.value === 'parts-total' && (ratioN.value as number) < 1 ? t('brews.mix.errors.nAtLeastOne') : null;
      },
      () => mixFromRatio(toL(ratioTotal.value as number), ratioN.value as number, convention.value as RatioConvention),
    ),
  );

  const strengthMix = computed(() =>
    attempt(
      num(stockStrength.value) && num(finalStrength.value) && num(finalVolume.value),
      () =>
        mustBePositive([
          [stockStrength.value, 'stockStrength'],
          [finalStrength.value, 'finalStrength'],
          [finalVolume.value, 'finalVolume'],
        ]) ?? ((finalStrength.value as number) > (stockStrength.value as number) ? t('brews.mix.errors.finalAboveStock') : null),
      () => {
        const totalL = toL(finalVolume.value as number);
        const concentrate = concentrateVolume(stockStrength.value as number, finalStrength.value as number, totalL);
        return { concentrate, water: totalL - concentrate };
      },
    ),
  );

  const ullageL = computed<number | null>(() => (options.tankFill() ? options.tankFill()!.ullageL : num(typedUllage.value) ? toL(typedUllage.value) : null));
  const topUpInput = computed<TopUpInput>(() => ({
    currentVolume: toL(currentVolume.value as number),
    currentStrength: currentStrength.value as number,
    targetVolume: toL(targetVolume.value as number),
    targetStrength: targetStrength.value as number,
    stockStrength: topStockStrength.value as number,
    // A tank already over its safe fill line has no room at all, never negative room.
    ullageL: Math.max(0, ullageL.value as number),
  }));
  const topUp = computed(() =>
    attempt(
      num(currentVolume.value) && num(currentStrength.value) && num(targetVolume.value) && num(targetStrength.value) && num(topStockStrength.value) && ullageL.value !== null,
      () =>
        mustNotBeNegative([
          [currentVolume.value, 'holdsNow'],
          [currentStrength.value, 'strengthNow'],
          [targetStrength.value, 'targetStrength'],
        ]) ??
        mustBePositive([
          [targetVolume.value, 'targetVolume'],
          [topStockStrength.value, 'stockStrength'],
        ]),
      () => topUpPlan(topUpInput.value),
    ),
  );
  // The volumes and strengths a refusal quotes, as the person typed them: their volume unit, their strength label.
  const refusalVolume = (litres: number) => `${formatNumberTrimmed(fromSI(litres, volumeUnit.value), 2)} ${volumeSymbol.value}`;
  const refusalStrength = (value: number) => `${formatNumberTrimmed(value, 3)} ${options.strengthUnit.value}`;
  const topUpRefusal = computed(() => (topUp.value?.ok && !topUp.value.value.ok ? topUpRefusalText(topUp.value.value, refusalVolume, refusalStrength) : null));

  const injection = computed(() =>
    attempt(
      num(injTarget.value) && num(injStock.value),
      () =>
        mustBePositive([
          [injTarget.value, 'lineStrength'],
          [injStock.value, 'concentrateStrength'],
          ...(num(flow.value) ? [[flow.value, 'lineFlow'] as [number, string]] : []),
        ]) ?? ((injTarget.value as number) > (injStock.value as number) ? t('brews.mix.errors.lineAboveConcentrate') : null),
      () => {
        const ratio = injectionRatio({ concentrateStrength: injStock.value as number, targetStrength: injTarget.value as number });
        const perMinute = num(flow.value) ? dosingRate({ flowLPerMin: flow.value, ratio }) : null;
        return { ratio, perMinute };
      },
    ),
  );

  // By mode: ratio, strength, top-up, injection.
  return {
    volumeSymbol,
    ratioN, convention, ratioTotal, readings, ratioMix,
    stockStrength, finalStrength, finalVolume, strengthMix,
    currentVolume, currentStrength, targetVolume, targetStrength, topStockStrength, typedUllage, topUp, topUpRefusal,
    injTarget, injStock, flow, injection,
  };
}

// What a typed entry makes the round ask before it sends: a stock that moved far since the last
// reading, or a culture outside its safe range (the limits and arithmetic are shared/readings'),
// and the warning a culture's temperature gives on the spot (a piece of src/stores/round.ts).
import { WARM_CULTURE_C } from '@shared/flags';
import { cultureTemperatureOutside, stockJump } from '@shared/readings';
import type { Tank } from '@shared/schemas';
import { formatNumber, formatTemperature, formatVolume, type UnitSystem } from '@shared/units';
import { i18n } from '@/i18n';
import type { ReadingPreview, TemperaturePreview } from './round-entry';

/** The questions an entry raises and the warning it gives. */
export interface EntryChecks {
  /** Each to be answered "Yes, this is right" before the round sends (or the entry corrected). */
  questions: string[];
  /** Worth telling the person on the spot, though the entry can be sent (a culture too cold or too warm). */
  warning: string | null;
}

/** The questions and warning of one tank's entry against its last stored stock and the culture's safe range. */
export function entryChecks(
  tank: Tank,
  reading: ReadingPreview,
  temperature: TemperaturePreview,
  lastGrossL: number | null,
  coldCultureC: number,
  unitSystem: UnitSystem,
): EntryChecks {
  const { t } = i18n.global;
  const questions: string[] = [];
  if (reading.state === 'ok' && lastGrossL !== null) {
    const jump = stockJump(lastGrossL, reading.grossL);
    if (jump.large) {
      const now = formatVolume(reading.grossL, 'metric');
      if (lastGrossL > 0 && Number.isFinite(jump.share)) {
        const params = { now, before: formatVolume(lastGrossL, 'metric'), share: formatNumber(jump.share * 100) };
        questions.push(t(jump.changeL < 0 ? 'round.checks.jumpDown' : 'round.checks.jumpUp', params));
      } else {
        // Nothing in the tank last time: no share to give.
        questions.push(t('round.checks.jumpUpFromEmpty', { now }));
      }
    }
  }
  let warning: string | null = null;
  if (tank.contents === 'culture' && temperature.state === 'ok') {
    const where = cultureTemperatureOutside(temperature.temperatureC, coldCultureC, WARM_CULTURE_C);
    const shown = formatTemperature(temperature.temperatureC, unitSystem);
    const cold = formatTemperature(coldCultureC, unitSystem, 0);
    const warm = formatTemperature(WARM_CULTURE_C, unitSystem, 0);
    if (where === 'cold') {
      questions.push(t('round.checks.coldQuestion', { shown, cold }));
      warning = t('round.checks.coldWarning', { cold });
    } else if (where === 'warm') {
      questions.push(t('round.checks.warmQuestion', { shown, warm }));
      warning = t('round.checks.warmWarning', { warm });
    }
  }
  return { questions, warning };
}

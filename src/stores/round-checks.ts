// What a typed entry makes the round ask before it sends: a stock that moved far since the last
// reading, or a culture outside its safe range (the limits and arithmetic are shared/readings'),
// and the warning a culture's temperature gives on the spot (a piece of src/stores/round.ts).
import { WARM_CULTURE_C } from '@shared/flags';
import { cultureTemperatureOutside, stockJump } from '@shared/readings';
import type { Tank } from '@shared/schemas';
import { formatNumber, formatTemperature, formatVolume, type UnitSystem } from '@shared/units';
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
  const questions: string[] = [];
  if (reading.state === 'ok' && lastGrossL !== null) {
    const jump = stockJump(lastGrossL, reading.grossL);
    if (jump.large) {
      const now = formatVolume(reading.grossL, 'metric');
      const before = lastGrossL > 0 ? formatVolume(lastGrossL, 'metric') : 'empty';
      const share = Number.isFinite(jump.share) ? ` (${formatNumber(jump.share * 100)} % ${jump.changeL < 0 ? 'less' : 'more'})` : '';
      questions.push(`${now} in the tank, ${jump.changeL < 0 ? 'down' : 'up'} from ${before} at the last reading${share}. Is the reading right?`);
    }
  }
  let warning: string | null = null;
  if (tank.contents === 'culture' && temperature.state === 'ok') {
    const where = cultureTemperatureOutside(temperature.temperatureC, coldCultureC, WARM_CULTURE_C);
    const shown = formatTemperature(temperature.temperatureC, unitSystem);
    const cold = formatTemperature(coldCultureC, unitSystem, 0);
    const warm = formatTemperature(WARM_CULTURE_C, unitSystem, 0);
    if (where === 'cold') {
      questions.push(`${shown} is below ${cold}, where a culture goes inactive. Is the thermometer reading right?`);
      warning = `Below about ${cold} a culture goes inactive: check its heater.`;
    } else if (where === 'warm') {
      questions.push(`${shown} is above ${warm}, the warmest a culture stays safe at. Is the thermometer reading right?`);
      warning = `Above about ${warm} a culture is harmed: check its heater and its thermostat.`;
    }
  }
  return { questions, warning };
}

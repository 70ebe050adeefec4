// Plausibility of a reading before it is sent: a stock that moved far since the last reading, or a
// culture outside the temperatures it stays safe at, is asked about rather than refused.
import { COLD_CULTURE_C, WARM_CULTURE_C } from '../flags/index';

/** Share of the last stock a new reading may move it by before the person is asked whether it is right: common practice, no published source. */
export const STOCK_JUMP_SHARE = 0.5;

/** How far a reading moves a tank's stock from the last one. */
export interface StockJump {
  /** New less last (L); negative for a fall. */
  changeL: number;
  /** The change as a share of the last stock (0.5 = half of it); Infinity for any change from an empty tank. */
  share: number;
  /** The change is more than the limit's share of the last stock. */
  large: boolean;
}

/** The change from `lastL` to `newL` (L), its share of `lastL`, and whether it is more than `limit` of it. */
export function stockJump(lastL: number, newL: number, limit = STOCK_JUMP_SHARE): StockJump {
  const changeL = newL - lastL;
  const share = changeL === 0 ? 0 : lastL > 0 ? Math.abs(changeL) / lastL : Number.POSITIVE_INFINITY;
  return { changeL, share, large: share > limit };
}

/** Where a culture's temperature lies against its safe range (°C): 'cold' below `coldC`, 'warm' above `warmC`, else null. */
export function cultureTemperatureOutside(temperatureC: number, coldC = COLD_CULTURE_C, warmC = WARM_CULTURE_C): 'cold' | 'warm' | null {
  if (temperatureC < coldC) return 'cold';
  if (temperatureC > warmC) return 'warm';
  return null;
}

// Flag rules: which conditions of a tank need a person, with the sentence that says so.
import type { FlagKind, TankContents } from '../schemas/index';
import { everyFlagCaution } from './cautions';
import { formatNumberTrimmed } from '../units/index';

/** Cultures go inactive below about this temperature (°C): common practice, no published source. */
export const COLD_CULTURE_C = 18;
/** Above about this temperature (°C) most farm cultures are harmed or die: common practice, no published source (value recalled from memory). */
export const WARM_CULTURE_C = 40;
/** At or under this temperature (°C) water and brews are at risk of freezing in lines and pumps: common practice, no published source. */
export const FROST_RISK_C = 2;
/** Days without a reading after which a tank is stale (default of the farm setting). */
export const STALE_AFTER_DAYS = 3;

/** The kinds of flag a tank can raise. */
export const TANK_FLAG_KINDS: readonly FlagKind[] = ['low-stock', 'stale-tank', 'cold-culture', 'frost-risk', 'overfill', 'suspected-leak'];

/**
 * Kinds that speak of a temperature. Only a temperature (a reading's, or one logged on the tank's
 * working brew) can end them — a reading of levels alone says nothing of the warmth — or a person,
 * by hand and with a note.
 */
export const TEMPERATURE_FLAG_KINDS: readonly FlagKind[] = ['frost-risk', 'cold-culture'];

/** True when a person may clear a flag of this kind by hand (with a note): the temperature kinds only; the rest end with their condition. */
export function clearableByHand(kind: FlagKind): boolean {
  return TEMPERATURE_FLAG_KINDS.includes(kind);
}

/** Our own names for the flag kinds. */
export const FLAG_LABELS: Record<FlagKind, string> = {
  'low-stock': 'Running low',
  'reorder-due': 'Time to reorder',
  'suspected-leak': 'Possible leak',
  'stale-tank': 'Not read lately',
  'cold-culture': 'Culture too cold',
  'frost-risk': 'Frost risk',
  'frost-ahead': 'Frost forecast',
  overfill: 'Above the fill line',
};

/**
 * The caution of each kind as short sentences in English, deferring to local codes and licensed practice
 * (empty: none applies). flagCautionSentences (./cautions) says the same in every language.
 */
export const FLAG_CAUTION_SENTENCES: Record<FlagKind, readonly string[]> = everyFlagCaution();

/** The caution each kind shows as one paragraph (null: none applies). */
export const FLAG_CAUTIONS: Record<FlagKind, string | null> = Object.fromEntries(
  Object.entries(FLAG_CAUTION_SENTENCES).map(([kind, sentences]) => [kind, sentences.length ? sentences.join(' ') : null]),
) as Record<FlagKind, string | null>;

/** What the rules look at for one tank; litres, mm, °C, epoch ms. */
export interface TankFlagInput {
  name: string;
  contents: TankContents;
  usableL: number | null;
  lowStockL: number;
  levelMm: number | null;
  safeFillLevelMm: number;
  /** The newest temperature known: a reading's, or one logged on the tank's working brew. */
  temperatureC: number | null;
  /** When the tank's level was last read (null: never). */
  takenAt: number | null;
  now: number;
  staleAfterDays: number;
  coldCultureC: number;
  frostRiskC: number;
  /** Suspected leak windows from shared/forecast (L lost, L/h). */
  leaks: { lossL: number; rateLPerHour: number }[];
}

/** A condition that holds now. */
export interface FlagCondition {
  kind: FlagKind;
  value: number;
  message: string;
}

const n = (v: number, d = 1) => formatNumberTrimmed(v, d);

/**
 * The tank flag kinds this input can decide (raise, keep or end): every kind, less the temperature
 * kinds when no temperature is known, so that an open temperature flag outlives readings of levels alone.
 */
export function judgedTankKinds(t: Pick<TankFlagInput, 'temperatureC'>): FlagKind[] {
  return t.temperatureC === null ? TANK_FLAG_KINDS.filter((k) => !TEMPERATURE_FLAG_KINDS.includes(k)) : [...TANK_FLAG_KINDS];
}

/** Every flag condition that holds for a tank now (empty when all is well). */
export function tankFlagConditions(t: TankFlagInput): FlagCondition[] {
  const out: FlagCondition[] = [];
  if (t.takenAt === null && t.temperatureC === null) return out;
  if (t.usableL !== null && t.lowStockL > 0 && t.usableL < t.lowStockL) {
    out.push({ kind: 'low-stock', value: t.usableL, message: `${t.name} has ${n(t.usableL, 0)} L usable, under its ${n(t.lowStockL, 0)} L threshold` });
  }
  const ageDays = t.takenAt === null ? 0 : (t.now - t.takenAt) / 86_400_000;
  if (t.takenAt !== null && ageDays >= t.staleAfterDays) out.push({ kind: 'stale-tank', value: ageDays, message: `${t.name} has not been read for ${n(Math.floor(ageDays), 0)} days` });
  if (t.temperatureC !== null) {
    if (t.temperatureC <= t.frostRiskC && (t.contents === 'water' || t.contents === 'culture' || t.contents === 'fertilizer' || t.contents === 'pest-solution')) {
      out.push({ kind: 'frost-risk', value: t.temperatureC, message: `${t.name} is at ${n(t.temperatureC)} °C (at or under ${n(t.frostRiskC)} °C): drain or protect` });
    } else if (t.contents === 'culture' && t.temperatureC < t.coldCultureC) {
      out.push({ kind: 'cold-culture', value: t.temperatureC, message: `${t.name} is at ${n(t.temperatureC)} °C, under ${n(t.coldCultureC)} °C: the culture slows or stops` });
    }
  }
  if (t.levelMm !== null && t.levelMm > t.safeFillLevelMm + 0.5) {
    out.push({ kind: 'overfill', value: t.levelMm - t.safeFillLevelMm, message: `${t.name} is ${n(t.levelMm - t.safeFillLevelMm, 0)} mm above its safe fill line` });
  }
  const worst = t.leaks.reduce<{ lossL: number; rateLPerHour: number } | null>((w, l) => (!w || l.rateLPerHour > w.rateLPerHour ? l : w), null);
  if (worst) out.push({ kind: 'suspected-leak', value: worst.rateLPerHour, message: `${t.name} lost ${n(worst.lossL, 0)} L during quiet hours (${n(worst.rateLPerHour)} L/h) with no draw planned` });
  return out;
}

export { cautionSentencesIn, flagCautionSentences, flagCautionText } from './cautions';
export { FROST_AHEAD_C, FROST_AHEAD_HOURS, defaultExposedToFrost, frostAheadMessage, frostAheadOf, watchedForFrost } from './frost-ahead';

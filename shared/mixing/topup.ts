import { nonNegative, positive } from '../checks';

/** A tank that already holds some mix, and what it should hold after topping up. */
export interface TopUpInput {
  /** Mix in the tank now (L). */
  currentVolume: number;
  /** Strength of the mix in the tank now (the strength unit, e.g. % or g/L; 0 for plain water). */
  currentStrength: number;
  /** Volume wanted after topping up (L). */
  targetVolume: number;
  /** Strength wanted after topping up (the strength unit). */
  targetStrength: number;
  /** Strength of the concentrate to be added (the strength unit). */
  stockStrength: number;
  /** Room left between the current level and the safe fill line (L). */
  ullageL: number;
}

/** Why a top-up cannot be planned. */
export type TopUpRefusal =
  | 'target-below-current'
  | 'exceeds-ullage'
  | 'already-too-strong'
  | 'stock-too-weak';

/** A top-up that works: what to add (L) and the volume that results (L). */
export interface TopUpPlanOk {
  ok: true;
  /** Concentrate to add (L). */
  concentrate: number;
  /** Water to add (L). */
  water: number;
  /** Volume in the tank afterwards (L). */
  finalVolume: number;
}

/**
 * The figures a refusal quotes, by its code (volumes in L, strengths in the strength unit), for a screen that
 * words the reason itself: `dilutedL` is where water alone reaches the target strength, null when that does not fit.
 */
export type TopUpRefusalFigures =
  | { code: 'target-below-current'; heldL: number; targetL: number }
  | { code: 'exceeds-ullage'; targetL: number; addL: number; roomL: number }
  | { code: 'already-too-strong'; targetL: number; targetStrength: number; dilutedL: number | null }
  | { code: 'stock-too-weak'; targetL: number; bestStrength: number; targetStrength: number };

/** A top-up that cannot work, with a reason a person can act on (English) and the figures it quotes. */
export type TopUpPlanRefused = TopUpRefusalFigures & { ok: false; reason: string };

/** Result of topUpPlan. */
export type TopUpPlan = TopUpPlanOk | TopUpPlanRefused;

function fmt(x: number): string {
  return String(Number(x.toPrecision(4)));
}

/**
 * Concentrate and water to add (L) so a tank holding currentVolume at currentStrength ends at
 * targetVolume and targetStrength: concentrate = (C_t·V_t − C_0·V_0)/C_s, water = V_t − V_0 − concentrate.
 * Refuses, with a reason, when the target volume is below the current one, when the addition would
 * pass the safe fill line (ullage), or when the target strength needs a negative amount of concentrate
 * (tank already too strong) or of water (concentrate too weak).
 */
export function topUpPlan(input: TopUpInput): TopUpPlan {
  const v0 = nonNegative('currentVolume', input?.currentVolume);
  const c0 = nonNegative('currentStrength', input.currentStrength);
  const vt = positive('targetVolume', input.targetVolume);
  const ct = nonNegative('targetStrength', input.targetStrength);
  const cs = positive('stockStrength', input.stockStrength);
  const ullage = nonNegative('ullageL', input.ullageL);
  // Rounding in the inputs' own arithmetic must not turn an exact plan into a refusal.
  const tolerance = 1e-9 * Math.max(1, vt);

  const addL = vt - v0;
  if (addL < -tolerance) {
    return {
      ok: false,
      code: 'target-below-current',
      heldL: v0,
      targetL: vt,
      reason: `The tank already holds ${fmt(v0)} L, more than the target of ${fmt(vt)} L; use or drain some first.`,
    };
  }
  if (addL > ullage + tolerance) {
    return {
      ok: false,
      code: 'exceeds-ullage',
      targetL: vt,
      addL,
      roomL: ullage,
      reason: `Reaching ${fmt(vt)} L means adding ${fmt(addL)} L, but only ${fmt(ullage)} L fits below the safe fill line.`,
    };
  }
  const concentrate = (ct * vt - c0 * v0) / cs;
  const water = addL - concentrate;
  if (concentrate < -tolerance) {
    const dilutedL = (c0 * v0) / ct;
    const waterAloneFits = ct > 0 && dilutedL - v0 <= ullage + tolerance;
    const hint = waterAloneFits ? ` Adding water alone reaches the target strength at ${fmt(dilutedL)} L.` : ' Use or drain some of it first.';
    return {
      ok: false,
      code: 'already-too-strong',
      targetL: vt,
      targetStrength: ct,
      dilutedL: waterAloneFits ? dilutedL : null,
      reason: `The tank already holds more active ingredient than ${fmt(vt)} L at strength ${fmt(ct)} contains.${hint}`,
    };
  }
  if (water < -tolerance) {
    const bestStrength = (c0 * v0 + cs * addL) / vt;
    return {
      ok: false,
      code: 'stock-too-weak',
      targetL: vt,
      bestStrength,
      targetStrength: ct,
      reason: `Even adding only concentrate, ${fmt(vt)} L reaches strength ${fmt(bestStrength)} at most, short of ${fmt(ct)}.`,
    };
  }
  return { ok: true, concentrate: Math.max(0, concentrate), water: Math.max(0, water), finalVolume: vt };
}

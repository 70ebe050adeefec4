import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { dailyUse, detectLeak, splitMovements, type LevelReading } from '@shared/forecast';

const HOUR = 3_600_000;
const DAY = 86_400_000;
const T0 = Date.UTC(2025, 2, 3); // Monday, invented scenario
const START_L = 100_000; // high enough that no generated series goes below empty

/** Sum of registered use (L, positive) and refill (L) over splitMovements' output. */
function movementTotals(readings: LevelReading[], noiseL: number) {
  let useL = 0;
  let refillL = 0;
  for (const m of splitMovements(readings, { noiseL })) {
    if (m.kind === 'use') useL -= m.changeL;
    if (m.kind === 'refill') refillL += m.changeL;
  }
  return { useL, refillL };
}

interface Step {
  /** Readings taken at the level reached after this step (at least 1). */
  readings: number;
  /** Level change before those readings (L): negative for use, positive for refill, 0 for none. */
  changeL: number;
}

/**
 * Readings for a tank that holds still between steps: two readings at START_L (1 h before Monday
 * 00:00 and at 00:00), then each step's readings spaced evenly up to Thursday 00:00, so that every
 * change falls inside Mon–Wed, the three whole days before `now`.
 */
function stepReadings(steps: Step[], jitter: number[] = []): LevelReading[] {
  const count = steps.reduce((sum, s) => sum + s.readings, 0);
  const spacing = (3 * DAY) / count;
  const out: LevelReading[] = [
    { takenAt: T0 - HOUR, volumeL: START_L + (jitter[0] ?? 0) },
    { takenAt: T0, volumeL: START_L + (jitter[1] ?? 0) },
  ];
  let level = START_L;
  let j = 0;
  for (const step of steps) {
    level += step.changeL;
    for (let r = 0; r < step.readings; r++) {
      j++;
      out.push({ takenAt: T0 + j * spacing, volumeL: level + (jitter[j + 1] ?? 0) });
    }
  }
  return out;
}

const NOW = T0 + 3 * DAY + HOUR;
const noiseArb = fc.integer({ min: 1, max: 20 });

/** Steps whose changes are well outside the band: at least three noise bands each. */
const stepsArb = (noiseL: number, maxReadings: number) =>
  fc.array(
    fc.record({
      readings: fc.integer({ min: 1, max: maxReadings }),
      kind: fc.constantFrom('use', 'refill', 'none'),
      amountL: fc.integer({ min: 3 * noiseL, max: 400 }),
    }),
    { minLength: 1, maxLength: 25 },
  );

describe('forecast property: a refill never counts as use', () => {
  it('counts every use step as use and every refill as refill, whatever the refill sizes', () => {
    fc.assert(
      fc.property(
        noiseArb.chain((noiseL) =>
          fc.tuple(fc.constant(noiseL), stepsArb(noiseL, 4), fc.array(fc.integer({ min: 3 * noiseL, max: 5000 }), { minLength: 25, maxLength: 25 })),
        ),
        ([noiseL, raw, otherRefills]) => {
          const steps = raw.map((s) => ({ readings: s.readings, changeL: s.kind === 'use' ? -s.amountL : s.kind === 'refill' ? s.amountL : 0 }));
          const useL = raw.filter((s) => s.kind === 'use').reduce((sum, s) => sum + s.amountL, 0);
          const refillL = raw.filter((s) => s.kind === 'refill').reduce((sum, s) => sum + s.amountL, 0);
          const options = { windowDays: 3, now: NOW, noiseL };

          const result = dailyUse(stepReadings(steps), options);
          expect(result.days).toBe(3);
          expect(result.totalUseL).toBeCloseTo(useL, 6);
          expect(result.totalRefillL).toBeCloseTo(refillL, 6);

          const bigger = steps.map((s, i) => (s.changeL > 0 ? { ...s, changeL: otherRefills[i] } : s));
          expect(dailyUse(stepReadings(bigger), options).totalUseL).toBeCloseTo(result.totalUseL, 6);
          expect(movementTotals(stepReadings(bigger), noiseL).useL).toBe(useL);
        },
      ),
    );
  });
});

describe('forecast property: jitter inside the noise band adds no use', () => {
  it('finds no movement, use or leak on a still tank read with jitter of at most ±noiseL/2', () => {
    fc.assert(
      fc.property(
        noiseArb.chain((noiseL) =>
          fc.tuple(
            fc.constant(noiseL),
            fc.array(fc.double({ min: -noiseL / 2, max: noiseL / 2, noNaN: true }), { minLength: 2, maxLength: 200 }),
          ),
        ),
        ([noiseL, jitter]) => {
          const spacing = (3 * DAY + HOUR) / (jitter.length - 1);
          const readings = jitter.map((e, i) => ({ takenAt: T0 - HOUR + i * spacing, volumeL: 5000 + e }));
          const moves = splitMovements(readings, { noiseL });
          expect(moves.map((m) => m.kind)).toEqual(['steady']);
          expect(dailyUse(readings, { windowDays: 3, now: NOW, noiseL }).totalUseL).toBe(0);
          expect(detectLeak(readings, { quietHours: { startHour: 22, endHour: 5 }, thresholdLPerHour: 0, noiseL })).toEqual([]);
        },
      ),
    );
  });

  it('keeps use within one noise band per real step, however many readings there are', () => {
    fc.assert(
      fc.property(
        noiseArb.chain((noiseL) =>
          fc.tuple(
            fc.constant(noiseL),
            stepsArb(noiseL, 12),
            fc.array(fc.double({ min: -noiseL / 2, max: noiseL / 2, noNaN: true }), { minLength: 320, maxLength: 320 }),
          ),
        ),
        ([noiseL, raw, jitter]) => {
          const steps = raw.map((s) => ({ readings: s.readings, changeL: s.kind === 'use' ? -s.amountL : s.kind === 'refill' ? s.amountL : 0 }));
          const uses = raw.filter((s) => s.kind === 'use');
          const useL = uses.reduce((sum, s) => sum + s.amountL, 0);
          const jittered = movementTotals(stepReadings(steps, jitter), noiseL).useL;
          // Each registered step is off by at most the two readings' jitter, ±noiseL/2 each.
          expect(Math.abs(jittered - useL)).toBeLessThanOrEqual(noiseL * uses.length + 1e-6);
        },
      ),
    );
  });
});

/** Irregular readings over Sunday..Friday, integer litres, unique instants. */
const irregular = fc.uniqueArray(
  fc.record({ takenAt: fc.integer({ min: T0 - DAY, max: T0 + 5 * DAY }), volumeL: fc.integer({ min: 0, max: 5000 }) }),
  { maxLength: 80, selector: (r) => r.takenAt },
);

describe('forecast property: scaling volumes and noise by k scales use by k', () => {
  it('scales daily use, its spread, totals and leak losses by k', () => {
    fc.assert(
      fc.property(
        irregular,
        fc.integer({ min: 0, max: 30 }),
        fc.double({ min: 0.1, max: 100, noNaN: true }),
        (readings, band, k) => {
          // Integer volumes against a band of n + 0.5 L: no difference sits on the band's edge, so
          // rounding in k·v cannot flip a classification.
          const noiseL = band + 0.5;
          const scaled = readings.map((r) => ({ takenAt: r.takenAt, volumeL: k * r.volumeL }));
          const close = (a: number, b: number) => expect(Math.abs(a - b)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(b)));

          const options = { windowDays: 5, now: T0 + 5 * DAY, noiseL };
          const base = dailyUse(readings, options);
          const big = dailyUse(scaled, { ...options, noiseL: k * noiseL });
          expect(big.days).toBe(base.days);
          close(big.meanLPerDay, k * base.meanLPerDay);
          close(big.sdLPerDay, k * base.sdLPerDay);
          close(big.totalUseL, k * base.totalUseL);
          close(big.totalRefillL, k * base.totalRefillL);

          expect(splitMovements(scaled, { noiseL: k * noiseL }).map((m) => m.kind)).toEqual(
            splitMovements(readings, { noiseL }).map((m) => m.kind),
          );

          const leak = { quietHours: { startHour: 22, endHour: 5 }, thresholdLPerHour: 0 };
          const leaks = detectLeak(readings, { ...leak, noiseL });
          const bigLeaks = detectLeak(scaled, { ...leak, noiseL: k * noiseL });
          expect(bigLeaks.length).toBe(leaks.length);
          bigLeaks.forEach((w, i) => {
            close(w.lossL, k * leaks[i].lossL);
            close(w.rateLPerHour, k * leaks[i].rateLPerHour);
          });
        },
      ),
    );
  });
});

describe('forecast property: input order does not matter', () => {
  const withRepeats = fc.array(
    fc.record({ takenAt: fc.integer({ min: 0, max: 200 }).map((h) => T0 - DAY + h * 0.6 * HOUR), volumeL: fc.integer({ min: 0, max: 3000 }) }),
    { maxLength: 80 },
  );

  it('gives the same movements, daily use and leaks for shuffled readings, repeated instants included', () => {
    fc.assert(
      fc.property(
        withRepeats.chain((rs) => fc.tuple(fc.constant(rs), fc.shuffledSubarray(rs, { minLength: rs.length, maxLength: rs.length }))),
        fc.integer({ min: 0, max: 40 }),
        ([readings, shuffled], noiseL) => {
          expect(splitMovements(shuffled, { noiseL })).toEqual(splitMovements(readings, { noiseL }));
          const options = { windowDays: 4, now: T0 + 4 * DAY, noiseL, utcOffsetMinutes: 330 };
          expect(dailyUse(shuffled, options)).toEqual(dailyUse(readings, options));
          const leak = { quietHours: { startHour: 21.5, endHour: 6 }, thresholdLPerHour: 1, noiseL };
          expect(detectLeak(shuffled, leak)).toEqual(detectLeak(readings, leak));
        },
      ),
    );
  });
});

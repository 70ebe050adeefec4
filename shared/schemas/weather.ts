import { z } from 'zod';

/**
 * The answer of an hourly forecast service of the Open-Meteo kind (GET /v1/forecast?latitude=…&longitude=…
 * &hourly=temperature_2m&forecast_days=3&timezone=UTC): hour stamps in UTC without a zone ("2026-12-03T14:00")
 * and the air temperature 2 m above ground in °C, one per hour. The shape is recalled from memory of the
 * service's documentation, not copied from it; anything else is refused as nonsense.
 */
export const hourlyForecastAnswerSchema = z
  .object({
    hourly_units: z.object({ temperature_2m: z.string() }).loose().optional(),
    hourly: z
      .object({
        time: z.array(z.string().regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2})?(Z|[+-]00:?00)?$/, 'an hour in UTC')).min(1).max(24 * 16),
        // The service sends null for an hour it has no value for.
        temperature_2m: z.array(z.number().finite().min(-90).max(60).nullable()),
      })
      .loose()
      .refine((h) => h.time.length === h.temperature_2m.length, 'as many temperatures as hours'),
  })
  .loose()
  .refine((a) => a.hourly_units?.temperature_2m === undefined || a.hourly_units.temperature_2m === '°C', 'temperatures in °C');
export type HourlyForecastAnswer = z.infer<typeof hourlyForecastAnswerSchema>;

/** One forecast hour: when (ISO, UTC) and the air temperature (°C). */
export interface ForecastHour {
  at: string;
  airC: number;
}

/** GET /api/farms/:id/frost: the farm's latest stored forecast and what it says of frost. */
export interface FarmFrost {
  farmId: number;
  /** False when the farm has no latitude and longitude: nothing is fetched. */
  located: boolean;
  /** Forecast air temperature under which the farm's exposed tanks are flagged (°C). */
  thresholdC: number;
  /** When the forecast shown was fetched (null: never). */
  fetchedAt: string | null;
  /** True when the last try failed or the forecast is older than two fetch intervals. */
  stale: boolean;
  /** What went wrong on the last try, in plain words (null: it worked). */
  problem: string | null;
  /** When the last try was made (null: never). */
  triedAt: string | null;
  /** The next 48 hours from the stored forecast. */
  hours: ForecastHour[];
  /** The coldest hour under the threshold in the next 48 hours (null: no frost ahead). */
  frost: { at: string; lowC: number } | null;
}

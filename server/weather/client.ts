// The hourly forecast client: asks a forecast service of the Open-Meteo kind (its documented JSON
// API, no key) for the next days' air temperature 2 m above ground at one place, through ky, and
// refuses any answer that is not that shape. WEATHER_URL says where the service is.
import ky, { HTTPError, TimeoutError } from 'ky';
import { hourlyForecastAnswerSchema, type ForecastHour } from '@shared/schemas';

/** Why a forecast could not be had, in words a farm manager can read. */
export class ForecastUnavailable extends Error {
  constructor(
    readonly reason: 'down' | 'slow' | 'nonsense',
    message: string,
  ) {
    super(message);
    this.name = 'ForecastUnavailable';
  }
}

/** The hourly air temperatures (°C, UTC hours) for the next `days` days at a place, oldest first; throws ForecastUnavailable. */
export async function fetchHourlyAirForecast(opts: { baseUrl: string; timeoutMs: number }, place: { latitude: number; longitude: number }, days = 3): Promise<ForecastHour[]> {
  let body: unknown;
  try {
    body = await ky
      .get(`${opts.baseUrl}/v1/forecast`, {
        searchParams: { latitude: place.latitude, longitude: place.longitude, hourly: 'temperature_2m', forecast_days: days, timezone: 'UTC' },
        timeout: opts.timeoutMs,
        // The job tries again at its next run; a retry here would only hold the run up.
        retry: 0,
        headers: { accept: 'application/json' },
      })
      .json();
  } catch (err) {
    if (err instanceof TimeoutError) throw new ForecastUnavailable('slow', `the forecast service did not answer within ${Math.round(opts.timeoutMs / 1000)} s`);
    if (err instanceof HTTPError) throw new ForecastUnavailable('down', `the forecast service answered ${err.response.status}`);
    if (err instanceof SyntaxError) throw new ForecastUnavailable('nonsense', 'the forecast service answered something that is not JSON');
    throw new ForecastUnavailable('down', 'the forecast service could not be reached');
  }
  const parsed = hourlyForecastAnswerSchema.safeParse(body);
  if (!parsed.success) throw new ForecastUnavailable('nonsense', 'the forecast service answered something that is not an hourly forecast');
  const { time, temperature_2m: temps } = parsed.data.hourly;
  const hours: ForecastHour[] = [];
  time.forEach((t, i) => {
    const airC = temps[i];
    const at = Date.parse(/(Z|[+-]\d\d:?\d\d)$/.test(t) ? t : `${t}Z`);
    if (airC !== null && Number.isFinite(at)) hours.push({ at: new Date(at).toISOString(), airC });
  });
  if (!hours.length) throw new ForecastUnavailable('nonsense', 'the forecast service answered without a single temperature');
  return hours.sort((a, b) => a.at.localeCompare(b.at));
}

// A tank's forecast as the API answers it (GET /api/tanks/:id/forecast).

/** A suspected leak: a fall during the farm's quiet hours (times ISO, loss in L, rate in L/h). */
export interface TankLeakWindow {
  from: string;
  to: string;
  lossL: number;
  rateLPerHour: number;
}

/** A tank's forecast: litres, L/day, days and ISO times, over the farm's local days (each with its own UTC offset). */
export interface TankForecastDto {
  tankId: number;
  /** Usable volume at the latest reading (L); null before the first reading. */
  usableL: number | null;
  /** Whole farm-local days before today that the forecast looks back over. */
  windowDays: number;
  meanLPerDay: number;
  /** Sample standard deviation of daily use (L/day). */
  sdLPerDay: number;
  /** Whole days of readings behind the rate. */
  days: number;
  /** Days the usable volume lasts at the mean rate; null when no use was seen. */
  daysOfCover: number | null;
  projectedEmptyAt: string | null;
  /** Half-width of the reading noise band (L). */
  noiseL: number;
  leaks: TankLeakWindow[];
}


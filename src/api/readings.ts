import type { CorrectionInput, Reading, RoundSubmitAnswer, RoundSubmitInput, SeriesPoint } from '@shared/schemas';
import { http } from './http';

/** Submits a round; each entry comes back stored, duplicate (already stored by an earlier try) or refused. */
export function submitRound(input: RoundSubmitInput): Promise<RoundSubmitAnswer> {
  return http.post<RoundSubmitAnswer>('/api/rounds', input);
}

/** A tank's readings, newest first, corrected ones included. */
export function fetchReadings(tankId: number, options: { from?: string; to?: string; limit?: number } = {}): Promise<Reading[]> {
  return http.get<Reading[]>(`/api/tanks/${tankId}/readings`, { query: options });
}

/** A tank's level and volume series; bucketed by hour, day or week (each bucket's last reading). */
export function fetchSeries(tankId: number, options: { from?: string; to?: string; bucket?: 'raw' | 'hour' | 'day' | 'week' } = {}): Promise<SeriesPoint[]> {
  return http.get<SeriesPoint[]>(`/api/tanks/${tankId}/series`, { query: options });
}

/** Replaces a wrong reading by a correction (the original stays in the audit trail). */
export function correctReading(readingId: number, input: CorrectionInput): Promise<Reading> {
  return http.post<Reading>(`/api/readings/${readingId}/correction`, input);
}

import type { Brew, BrewCreateInput, BrewStatus, BrewUpdateInput } from '@shared/schemas';
import { http } from './http';

/** Which brews to list; all the user's farms when empty. */
export interface BrewFilter {
  farmId?: number;
  tankId?: number;
  status?: BrewStatus;
}

/** Brews newest first, scoped by the server to the user's farms. */
export function fetchBrews(filter: BrewFilter = {}): Promise<Brew[]> {
  return http.get<Brew[]>('/api/brews', { query: { farmId: filter.farmId, tankId: filter.tankId, status: filter.status } });
}

/** Logs a brew (volumes in L); each input line becomes a use of that input's stock. */
export function createBrew(input: BrewCreateInput): Promise<Brew> {
  return http.post<Brew>('/api/brews', input);
}

/** Changes a brew's status, ready date or notes. */
export function updateBrew(brewId: number, input: BrewUpdateInput): Promise<Brew> {
  return http.patch<Brew>(`/api/brews/${brewId}`, input);
}

/** Logs a culture temperature (°C). */
export function logBrewTemperature(brewId: number, input: { temperatureC: number; at?: string }): Promise<Brew> {
  return http.post<Brew>(`/api/brews/${brewId}/temperatures`, input);
}

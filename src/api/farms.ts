import type { Farm, FarmCreateInput, FarmUpdateInput } from '@shared/schemas';
import { http } from './http';

/** The farms this user may see, archived ones too when asked. */
export function fetchFarms(options: { includeArchived?: boolean } = {}): Promise<Farm[]> {
  return http.get<Farm[]>('/api/farms', { query: { includeArchived: options.includeArchived ? 'true' : undefined } });
}

/** One farm. */
export function fetchFarm(farmId: number): Promise<Farm> {
  return http.get<Farm>(`/api/farms/${farmId}`);
}

/** Creates a farm (owners and managers). */
export function createFarm(input: FarmCreateInput): Promise<Farm> {
  return http.post<Farm>('/api/farms', input);
}

/** Edits, archives (archived: true) or restores (archived: false) a farm. */
export function updateFarm(farmId: number, input: FarmUpdateInput): Promise<Farm> {
  return http.patch<Farm>(`/api/farms/${farmId}`, input);
}

import type { Farm, FarmCreateInput, FarmFrost, FarmUpdateInput } from '@shared/schemas';
import type { UnitSystem } from '@shared/units';
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

/** The address of the sheet of labels for every active tank of a farm (PDF, A4 or Letter). */
export function farmLabelsUrl(farmId: number, options: { unit: UnitSystem; paper: 'a4' | 'letter' }): string {
  return `/api/farms/${farmId}/labels.pdf?${new URLSearchParams({ unit: options.unit, paper: options.paper })}`;
}

/** The farm's stored 48-hour air forecast, its frost threshold and whether the forecast is old. */
export function fetchFarmFrost(farmId: number): Promise<FarmFrost> {
  return http.get<FarmFrost>(`/api/farms/${farmId}/frost`);
}

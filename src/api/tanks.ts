import type { TankForecastDto, TankLeakWindow, CalibrationTableDto, Tank, TankCalibrationVersion, TankContentsPeriod, TankCreateInput, TankUpdateInput, UnitSystem } from '@shared/schemas';
import { http } from './http';

/** A calibration table as GET /api/tanks/:id/calibration returns it: rows by tube reading, in the units named. */
export type CalibrationTable = CalibrationTableDto;

/** A tank's forecast as GET /api/tanks/:id/forecast returns it (the DTO in shared/schemas). */
export type TankForecast = TankForecastDto;
export type { TankLeakWindow };

/** Tanks the user may see, in walking order; one farm's when farmId is given. */
export function fetchTanks(options: { farmId?: number; includeArchived?: boolean } = {}): Promise<Tank[]> {
  return http.get<Tank[]>('/api/tanks', { query: { farmId: options.farmId, includeArchived: options.includeArchived ? 'true' : undefined } });
}

/** One tank. */
export function fetchTank(tankId: number): Promise<Tank> {
  return http.get<Tank>(`/api/tanks/${tankId}`);
}

/** Creates a tank (owners and managers). */
export function createTank(input: TankCreateInput): Promise<Tank> {
  return http.post<Tank>('/api/tanks', input);
}

/** Edits a tank; a new shape or datum makes a new calibration version, new contents a new contents period. */
export function updateTank(tankId: number, input: TankUpdateInput): Promise<Tank> {
  return http.patch<Tank>(`/api/tanks/${tankId}`, input);
}

/** The tank's contents history, newest first. */
export function fetchContentsHistory(tankId: number): Promise<TankContentsPeriod[]> {
  return http.get<TankContentsPeriod[]>(`/api/tanks/${tankId}/contents`);
}

/** The tank's use rate, days of cover, projected empty date and suspected leaks, computed now. */
export function fetchForecast(tankId: number): Promise<TankForecast> {
  return http.get<TankForecast>(`/api/tanks/${tankId}/forecast`);
}

/** The calibration table at `step` (mm for metric, inches for US). */
export function fetchCalibration(tankId: number, step: number, unit: UnitSystem): Promise<CalibrationTable> {
  return http.get<CalibrationTable>(`/api/tanks/${tankId}/calibration`, { query: { step, unit } });
}

/** Every calibration the tank has had, numbered 1, 2, 3… in the order they were made, oldest first. */
export function fetchCalibrations(tankId: number): Promise<TankCalibrationVersion[]> {
  return http.get<TankCalibrationVersion[]>(`/api/tanks/${tankId}/calibrations`);
}

/** The address of the calibration table as a CSV download (formula-like cells escaped by the server). */
export function calibrationCsvUrl(tankId: number, step: number, unit: UnitSystem): string {
  return `/api/tanks/${tankId}/calibration?${new URLSearchParams({ step: String(step), unit, format: 'csv' })}`;
}

/** The address of the tank's printable gauge strip PDF: a mark every `every` L (metric) or US gal (us). */
export function gaugeStripUrl(tankId: number, options: { every: number; unit: UnitSystem; paper: 'a4' | 'letter'; label?: boolean }): string {
  const query = new URLSearchParams({ every: String(options.every), unit: options.unit, paper: options.paper });
  if (options.label) query.set('label', 'true');
  return `/api/tanks/${tankId}/gauge-strip.pdf?${query}`;
}

/** The address of the tank's label PDF (QR code to the round at this tank), capacities in `unit`. */
export function tankLabelUrl(tankId: number, unit: UnitSystem): string {
  return `/api/tanks/${tankId}/label.pdf?${new URLSearchParams({ unit })}`;
}

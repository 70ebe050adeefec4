// Words the Logger files screen shows for the mapping choices and import outcomes.
import { IMPORT_POLICY_TITLES, type DateFormat, type Delimiter, type ImportPolicy, type TimeFormat, type TimestampFormat, type ValueKind } from '@shared/imports';
import type { ImportStatus } from '@shared/schemas';
import { UNIT_SYMBOLS, type LengthUnit, type PressureUnit } from '@shared/units';

export const DELIMITER_LABELS: Record<Delimiter, string> = {
  auto: 'Work it out from the file',
  ',': 'Comma ( , )',
  ';': 'Semicolon ( ; )',
  '\t': 'Tab',
};

/** How each layout looks, with one example each (1 March 2026, 6 in the morning). */
export const TIMESTAMP_FORMAT_LABELS: Record<TimestampFormat, string> = {
  iso8601: 'ISO 8601 with its offset — 2026-03-01T06:00:00+01:00',
  'YYYY-MM-DD HH:mm:ss': 'Year-month-day, seconds — 2026-03-01 06:00:00',
  'YYYY-MM-DD HH:mm': 'Year-month-day — 2026-03-01 06:00',
  'DD/MM/YYYY HH:mm:ss': 'Day/month/year, seconds — 01/03/2026 06:00:00',
  'DD/MM/YYYY HH:mm': 'Day/month/year — 01/03/2026 06:00',
  'MM/DD/YYYY HH:mm:ss': 'Month/day/year, seconds — 03/01/2026 06:00:00',
  'MM/DD/YYYY HH:mm': 'Month/day/year — 03/01/2026 06:00',
  'DD.MM.YYYY HH:mm:ss': 'Day.month.year, seconds — 01.03.2026 06:00:00',
  'DD.MM.YYYY HH:mm': 'Day.month.year — 01.03.2026 06:00',
};

/** Date-only layouts, for a file with the time of day in a column of its own. */
export const DATE_FORMAT_LABELS: Record<DateFormat, string> = {
  'YYYY-MM-DD': 'Year-month-day, time in its own column — 2026-03-01',
  'DD/MM/YYYY': 'Day/month/year, time in its own column — 01/03/2026',
  'MM/DD/YYYY': 'Month/day/year, time in its own column — 03/01/2026',
  'DD.MM.YYYY': 'Day.month.year, time in its own column — 01.03.2026',
};

export const TIME_FORMAT_LABELS: Record<TimeFormat, string> = {
  'HH:mm:ss': '24-hour, seconds — 06:00:00',
  'HH:mm': '24-hour — 06:00',
  'hh:mm:ss AM/PM': '12-hour with AM/PM, seconds — 06:00:00 AM',
  'hh:mm AM/PM': '12-hour with AM/PM — 6:00 AM',
};

export const VALUE_KIND_LABELS: Record<ValueKind, string> = {
  level: 'Level above the tank floor',
  ultrasonic: 'Distance down from the sensor (ultrasonic)',
  pressure: 'Gauge pressure at the sensor',
};

const UNIT_NAMES: Record<LengthUnit | PressureUnit, string> = {
  mm: 'millimetres',
  cm: 'centimetres',
  m: 'metres',
  in: 'inches',
  ft: 'feet',
  kPa: 'kilopascals',
  bar: 'bar',
  psi: 'pounds per square inch',
  mH2O: 'metres of water',
  inH2O: 'inches of water',
};

/** "mm — millimetres". */
export function valueUnitLabel(unit: LengthUnit | PressureUnit): string {
  return `${UNIT_SYMBOLS[unit]} — ${UNIT_NAMES[unit]}`;
}

/** Each policy's one title (shared with the server's messages) and what it does. */
export const POLICY_LABELS: Record<ImportPolicy, { title: string; detail: string }> = {
  'reject-file': {
    title: IMPORT_POLICY_TITLES['reject-file'],
    detail: 'Nothing from the file is stored until every row reads cleanly. Every bad line is listed so the file can be fixed and sent again.',
  },
  'valid-rows': {
    title: IMPORT_POLICY_TITLES['valid-rows'],
    detail: 'Good rows are stored now; the bad ones are listed with the reason and can be downloaded as a CSV.',
  },
};

export const STATUS_LABELS: Record<ImportStatus, { label: string; severity: 'success' | 'info' | 'warn' | 'danger' | 'secondary' }> = {
  queued: { label: 'Waiting', severity: 'secondary' },
  importing: { label: 'Importing', severity: 'info' },
  imported: { label: 'Imported', severity: 'success' },
  rejected: { label: 'Refused', severity: 'danger' },
  failed: { label: 'Stopped', severity: 'warn' },
  duplicate: { label: 'Already imported', severity: 'secondary' },
};

/** "3.4 MB", "820 KB", "512 B", in 1024-byte steps as the server's upload limit counts them. */
export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(bytes < 10 * 1024 ? 1 : 0)} KB`;
  const mb = bytes / (1024 * 1024);
  return `${mb.toFixed(mb < 10 ? 1 : 0)} MB`;
}

// Words the Logger files screen shows for the mapping choices and import outcomes, in the screen's language.
// Functions, not constants: each call reads the language in use, so a change of language redraws them.
import type { DateFormat, Delimiter, ImportPolicy, TimeFormat, TimestampFormat, ValueKind } from '@shared/imports';
import type { ImportStatus } from '@shared/schemas';
import { formatNumber, UNIT_SYMBOLS, type LengthUnit, type PressureUnit } from '@shared/units';
import { i18n } from '@/i18n';

const t = (key: string, named: Record<string, unknown> = {}) => i18n.global.t(key, named);

const DELIMITER_KEYS: Record<Delimiter, string> = { auto: 'auto', ',': 'comma', ';': 'semicolon', '\t': 'tab' };

/** "Comma ( , )", "Work it out from the file"… */
export function delimiterLabel(delimiter: Delimiter): string {
  return t(`imports.delimiters.${DELIMITER_KEYS[delimiter]}`);
}

/** "Read as comma ( , ) separated." for the separator the file was read with. */
export function detectedDelimiterText(delimiter: Exclude<Delimiter, 'auto'>): string {
  return t(`imports.mapping.detected.${DELIMITER_KEYS[delimiter]}`);
}

// How each layout looks, with one example each (1 March 2026, 6 in the morning); the examples are the
// file's own characters, the same in every language.
const TIMESTAMP_FORMATS: Record<TimestampFormat, [key: string, example: string]> = {
  iso8601: ['iso8601', '2026-03-01T06:00:00+01:00'],
  'YYYY-MM-DD HH:mm:ss': ['ymdSeconds', '2026-03-01 06:00:00'],
  'YYYY-MM-DD HH:mm': ['ymd', '2026-03-01 06:00'],
  'DD/MM/YYYY HH:mm:ss': ['dmySlashSeconds', '01/03/2026 06:00:00'],
  'DD/MM/YYYY HH:mm': ['dmySlash', '01/03/2026 06:00'],
  'MM/DD/YYYY HH:mm:ss': ['mdySlashSeconds', '03/01/2026 06:00:00'],
  'MM/DD/YYYY HH:mm': ['mdySlash', '03/01/2026 06:00'],
  'DD.MM.YYYY HH:mm:ss': ['dmyDotSeconds', '01.03.2026 06:00:00'],
  'DD.MM.YYYY HH:mm': ['dmyDot', '01.03.2026 06:00'],
};

/** A date-and-time layout with its example: "Day/month/year — 01/03/2026 06:00". */
export function timestampFormatLabel(format: TimestampFormat): string {
  const [key, example] = TIMESTAMP_FORMATS[format];
  return t(`imports.formats.${key}`, { example });
}

/** Date-only layouts, for a file with the time of day in a column of its own. */
const DATE_FORMATS: Record<DateFormat, [key: string, example: string]> = {
  'YYYY-MM-DD': ['ymd', '2026-03-01'],
  'DD/MM/YYYY': ['dmySlash', '01/03/2026'],
  'MM/DD/YYYY': ['mdySlash', '03/01/2026'],
  'DD.MM.YYYY': ['dmyDot', '01.03.2026'],
};

/** A date-only layout with its example. */
export function dateFormatLabel(format: DateFormat): string {
  const [key, example] = DATE_FORMATS[format];
  return t(`imports.dateFormats.${key}`, { example });
}

const TIME_FORMATS: Record<TimeFormat, [key: string, example: string]> = {
  'HH:mm:ss': ['h24Seconds', '06:00:00'],
  'HH:mm': ['h24', '06:00'],
  'hh:mm:ss AM/PM': ['h12Seconds', '06:00:00 AM'],
  'hh:mm AM/PM': ['h12', '6:00 AM'],
};

/** A time-of-day layout with its example. */
export function timeFormatLabel(format: TimeFormat): string {
  const [key, example] = TIME_FORMATS[format];
  return t(`imports.timeFormats.${key}`, { example });
}

/** What the value column measures, in words. */
export function valueKindLabel(kind: ValueKind): string {
  return t(`imports.valueKinds.${kind}`);
}

/** "mm — millimetres". */
export function valueUnitLabel(unit: LengthUnit | PressureUnit): string {
  return `${UNIT_SYMBOLS[unit]} — ${t(`imports.unitNames.${unit}`)}`;
}

const POLICY_KEYS: Record<ImportPolicy, string> = { 'reject-file': 'rejectFile', 'valid-rows': 'validRows' };

/** Each policy's one title (in English the words of the server's messages, IMPORT_POLICY_TITLES) and what it does. */
export function policyLabel(policy: ImportPolicy): { title: string; detail: string } {
  return { title: t(`imports.policy.${POLICY_KEYS[policy]}.title`), detail: t(`imports.policy.${POLICY_KEYS[policy]}.detail`) };
}

const STATUS_SEVERITIES: Record<ImportStatus, 'success' | 'info' | 'warn' | 'danger' | 'secondary'> = {
  queued: 'secondary',
  importing: 'info',
  imported: 'success',
  rejected: 'danger',
  failed: 'warn',
  duplicate: 'secondary',
};

/** An import status's word and its tag colour. */
export function statusLabel(status: ImportStatus): { label: string; severity: 'success' | 'info' | 'warn' | 'danger' | 'secondary' } {
  return { label: t(`imports.status.${status}`), severity: STATUS_SEVERITIES[status] };
}

/** "3.4 MB", "820 KB", "512 B", in 1024-byte steps as the server's upload limit counts them. */
export function formatBytes(bytes: number): string {
  if (bytes < 1024) return t('imports.bytes.b', { n: formatNumber(bytes, 0) });
  if (bytes < 1024 * 1024) return t('imports.bytes.kb', { n: formatNumber(bytes / 1024, bytes < 10 * 1024 ? 1 : 0) });
  const mb = bytes / (1024 * 1024);
  return t('imports.bytes.mb', { n: formatNumber(mb, mb < 10 ? 1 : 0) });
}

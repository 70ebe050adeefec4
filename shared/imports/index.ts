// Logger file import: the column mapping, timestamp and number parsing, the content check of an
// upload, and the row reader that turns each CSV record into a reading or a reported problem.
export {
  TIMESTAMP_FORMATS,
  DATE_FORMATS,
  TIME_FORMATS,
  VALUE_KINDS,
  DELIMITERS,
  IMPORT_POLICIES,
  IMPORT_POLICY_TITLES,
  MAX_COLUMN_INDEX,
  isDateFormat,
  needsTimeZone,
  importMappingSchema,
} from './mapping';
export type { TimestampFormat, DateFormat, TimeFormat, ValueKind, Delimiter, ImportPolicy, ColumnRef, ImportMapping, ImportMappingInput } from './mapping';
export { MIN_TIMESTAMP_YEAR, daysInMonth, formatInstant, formatOffset, zoneConverter, timestampParser, dateCellParser, timeCellParser, dateTimeParser } from './timestamps';
export type { TimestampResult, DateTimeResult, DateTimePart, RepeatedTime, WallClockInstant } from './timestamps';
export { parseLoggerNumber } from './numbers';
export type { NumberResult } from './numbers';
export { delimiterCandidates, csvParseOptions, stripBom, isBlankRow, lineBreaksInside } from './csv';
export type { FieldDelimiter, LineBreak } from './csv';
export { TEMPERATURE_RANGE_C, FUTURE_TOLERANCE_MS, mappingProblem, createImportReader, refusedFileReason } from './rows';
export type { ImportField, ImportProblem, ImportNotice, ImportedReading, FeedResult, ImportCounts, ImportReader, ImportReaderOptions } from './rows';
export { createInstantTally } from './repeats';
export type { InstantTally } from './repeats';
export { SNIFF_BYTES, sniffCsv } from './sniff';
export type { SniffResult } from './sniff';
export { MAX_RECORD_BYTES, createRecordGuard } from './record-length';
export type { RecordGuard, RecordProblem } from './record-length';

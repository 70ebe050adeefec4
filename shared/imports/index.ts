// Logger file import: the column mapping, timestamp and number parsing, the content check of an
// upload, and the row reader that turns each CSV record into a reading or a reported problem.
export { TIMESTAMP_FORMATS, VALUE_KINDS, DELIMITERS, IMPORT_POLICIES, MAX_COLUMN_INDEX, needsTimeZone, importMappingSchema } from './mapping';
export type { TimestampFormat, ValueKind, Delimiter, ImportPolicy, ColumnRef, ImportMapping, ImportMappingInput } from './mapping';
export { MIN_TIMESTAMP_YEAR, daysInMonth, zoneConverter, timestampParser } from './timestamps';
export type { TimestampResult } from './timestamps';
export { parseDecimal } from './numbers';
export type { NumberResult } from './numbers';
export { delimiterCandidates, csvParseOptions, stripBom, isBlankRow, lineBreaksInside } from './csv';
export type { FieldDelimiter, LineBreak } from './csv';
export { TEMPERATURE_RANGE_C, FUTURE_TOLERANCE_MS, mappingProblem, createImportReader } from './rows';
export type { ImportField, ImportProblem, ImportedReading, FeedResult, ImportCounts, ImportReader, ImportReaderOptions } from './rows';
export { SNIFF_BYTES, sniffCsv } from './sniff';
export type { SniffResult } from './sniff';
export { MAX_RECORD_BYTES, createRecordGuard } from './guard';
export type { RecordGuard, RecordProblem } from './guard';

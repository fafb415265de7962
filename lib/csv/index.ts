export { guessColumnMapping, mappingProblems, normalizeHeader, type ColumnMapping } from "./column-mapping";
export { sampleCsvHeaderLine, sampleCsvLines, type SampleCsvRecord } from "./export-samples";
export { parseSampleCsv, type CsvImportError, type CsvImportOptions, type CsvImportParse, type CsvImportRow } from "./import-samples";
export { isKnownZone, parseBoolean, parseDecimal, parseEnum, parseInstant, zonedLocalToUtcMs, type CellResult } from "./parse-values";
export { SAMPLE_CSV_COLUMNS, SAMPLE_CSV_COLUMN_BY_FIELD, type SampleCsvColumn, type SampleCsvField } from "./sample-columns";

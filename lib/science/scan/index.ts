/** Scan reading: XY/XYE, CSV and pdCIF text to a {@link Scan}, plus writers for round trips and export. */
export { parseScan, DEFAULT_MAX_BYTES, DEFAULT_MAX_POINTS, DEFAULT_MIN_POINTS, type ParseScanOptions } from "./parse-scan";
export { ScanParseError, type ScanParseErrorCode, type ScanParseErrorDetails } from "./errors";
export { detectFormat, type ScanFormat, type DetectedFormat } from "./detect";
export { parseXy } from "./parse-xy";
export { parseCsv, type CsvSeparator } from "./parse-csv";
export { classifyColumnName, mapColumns, type ColumnName, type ColumnRole, type ColumnMap } from "./columns";
export { parsePdCif } from "./parse-pdcif";
export { writeXy, writeCsv, writePdCif, type WriteScanOptions } from "./write-scan";

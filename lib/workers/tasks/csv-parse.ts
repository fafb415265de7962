/** Worker task: parse and validate a sample CSV (papaparse + zod per row); database checks stay in the DAL. */
import { parseSampleCsv, type CsvImportParse } from "@/lib/csv";

export default function csvParse(input: { csv: string; options: Parameters<typeof parseSampleCsv>[1] }): CsvImportParse {
  return parseSampleCsv(input.csv, input.options);
}

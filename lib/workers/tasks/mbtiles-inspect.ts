/** Worker task: full check of an uploaded MBTiles file (see lib/mbtiles/reader.ts). */
import { inspectMbtilesFile, type MbtilesInspection } from "@/lib/mbtiles";

export default function mbtilesInspect(input: { path: string }): Promise<MbtilesInspection> {
  return inspectMbtilesFile(input.path);
}

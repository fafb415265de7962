export { MbtilesError } from "./errors";
export { validateMbtilesMetadata, type MbtilesMetadata } from "./metadata";
export { inspectMbtilesFile, openMbtilesFile, type MbtilesInspection, type MbtilesReader } from "./reader";
export { MAX_REQUEST_ZOOM, mbtilesRow, parseTileAddress, type TileAddress } from "./tile-address";
export { RASTER_TILE_FORMATS, rasterFormatOf, sniffTileFormat, tileContentType, type RasterTileFormat } from "./tile-format";

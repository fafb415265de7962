/**
 * Map symbols as small inline SVGs. Meaning is carried by shape (after the categorical symbol idea of
 * FGDC-STD-013-2006; shapes per type: common practice): stations are diamonds; samples are triangles (rock: hand sample,
 * chip, channel, core), circles (soil), squares (stream sediment), open triangles (float: not in place),
 * crosses (other). Colour only reinforces the shape.
 */

export type SymbolKind = "station" | "rock" | "soil" | "stream" | "float" | "other";

const ROCK = new Set(["hand_sample", "chip", "channel", "core"]);

/** The symbol of a sample type. */
export function sampleSymbol(sampleType: string): SymbolKind {
  if (ROCK.has(sampleType)) return "rock";
  if (sampleType === "soil") return "soil";
  if (sampleType === "stream_sediment") return "stream";
  if (sampleType === "float") return "float";
  return "other";
}

export const SYMBOL_LABELS: Record<SymbolKind, string> = {
  station: "Station",
  rock: "Rock sample (hand sample, chip, channel, core)",
  soil: "Soil sample",
  stream: "Stream sediment sample",
  float: "Float (not in place; position approximate)",
  other: "Other sample",
};

const SAMPLE_FILL = "#1d5c63";
const STATION_FILL = "#b8561b";
const OUTLINE = "#ffffff";

/** SVG markup of a symbol, `size` px square. `highlight` draws a thick ring (selected / being moved). */
export function symbolSvg(kind: SymbolKind, size = 18, highlight = false): string {
  const s = size;
  const h = s / 2;
  const ring = highlight ? `<circle cx="${h}" cy="${h}" r="${h - 1}" fill="none" stroke="#f5b301" stroke-width="3"/>` : "";
  let shape: string;
  switch (kind) {
    case "station":
      shape = `<polygon points="${h},1 ${s - 1},${h} ${h},${s - 1} 1,${h}" fill="${STATION_FILL}" stroke="${OUTLINE}" stroke-width="2"/><circle cx="${h}" cy="${h}" r="${s / 9}" fill="${OUTLINE}"/>`;
      break;
    case "rock":
      shape = `<polygon points="${h},2 ${s - 2},${s - 3} 2,${s - 3}" fill="${SAMPLE_FILL}" stroke="${OUTLINE}" stroke-width="1.5"/>`;
      break;
    case "float":
      shape = `<polygon points="${h},3 ${s - 3},${s - 3} 3,${s - 3}" fill="${OUTLINE}" stroke="${SAMPLE_FILL}" stroke-width="2.5"/>`;
      break;
    case "soil":
      shape = `<circle cx="${h}" cy="${h}" r="${h - 3}" fill="${SAMPLE_FILL}" stroke="${OUTLINE}" stroke-width="1.5"/>`;
      break;
    case "stream":
      shape = `<rect x="3" y="3" width="${s - 6}" height="${s - 6}" fill="${SAMPLE_FILL}" stroke="${OUTLINE}" stroke-width="1.5"/>`;
      break;
    default:
      shape = `<path d="M${h} 2 V${s - 2} M2 ${h} H${s - 2}" stroke="${OUTLINE}" stroke-width="5"/><path d="M${h} 3 V${s - 3} M3 ${h} H${s - 3}" stroke="${SAMPLE_FILL}" stroke-width="2.5"/>`;
  }
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${s}" height="${s}" viewBox="0 0 ${s} ${s}" aria-hidden="true">${shape}${ring}</svg>`;
}

/** A cluster bubble: a circle sized by count, with the count; a diamond notch when it holds stations. */
export function clusterSvg(count: number, hasStations: boolean): { svg: string; size: number } {
  const size = count < 10 ? 30 : count < 100 ? 36 : count < 1000 ? 42 : 48;
  const h = size / 2;
  const label = count >= 1000 ? `${Math.round(count / 100) / 10}k` : String(count);
  const notch = hasStations ? `<polygon points="${h},0 ${h + 6},6 ${h},12 ${h - 6},6" fill="#b8561b" stroke="#fff" stroke-width="1.5"/>` : "";
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${size}" height="${size}" viewBox="0 0 ${size} ${size}" aria-hidden="true"><circle cx="${h}" cy="${h}" r="${h - 2}" fill="#1d5c63" fill-opacity="0.85" stroke="#fff" stroke-width="2.5"/><text x="${h}" y="${h + 4}" text-anchor="middle" font-family="system-ui,sans-serif" font-size="12" font-weight="700" fill="#fff">${label}</text>${notch}</svg>`;
  return { svg, size };
}

/**
 * The invented demo scenario: a reconnaissance project in the Iberian Pyrite Belt (real coordinates,
 * invented company, people and samples). Deterministic: the same seed gives the same data.
 */
export const DEMO_PASSWORD_NOTE = "Demo accounts (invented people; passwords for local use only):";

export const DEMO_USERS = [
  { key: "admin", name: "Site Admin", email: "admin@lithodex.example", password: "admin-demo-2026", siteRole: "admin" as const },
  { key: "lead", name: "Marta Vidal", email: "lead@lithodex.example", password: "lead-demo-2026", role: "lead" as const },
  { key: "field", name: "Tomás Ferreira", email: "field@lithodex.example", password: "field-demo-2026", role: "field_geologist" as const },
  { key: "field2", name: "Aiko Brandt", email: "field2@lithodex.example", password: "field-demo-2026", role: "field_geologist" as const },
  { key: "lab", name: "Priya Raman", email: "lab@lithodex.example", password: "lab-demo-2026", role: "lab_analyst" as const },
  { key: "consultant", name: "Owen Kettle", email: "consultant@lithodex.example", password: "consultant-demo-2026", role: "consultant" as const },
];

export const DEMO_PROJECT = {
  code: "APR",
  name: "Arroyo Pinar Cu–Zn reconnaissance",
  region: "Iberian Pyrite Belt, Huelva, Spain",
  description:
    "Mapping and sampling of felsic volcanic and shale units around old gossans, screening alteration and sulfide mineralogy by XRD before a drill programme.",
  labEmail: "reception@lab.lithodex.example",
};

export const DEMO_OTHER_PROJECT = { code: "LGR", name: "Loma Gris orientation survey", region: "Sierra de Aracena, Spain" };

/** Station centres in the district (lon −6.78…−6.42, lat 37.58…37.78). */
export const DEMO_STATIONS: { name: string; lat: number; lon: number; lithology: string; description: string }[] = [
  { name: "Gossan ridge north", lat: 37.7412, lon: -6.6213, lithology: "gossan", description: "Iron-oxide cap over felsic volcanics; boxwork after sulfides." },
  { name: "Gossan ridge south", lat: 37.7351, lon: -6.6178, lithology: "gossan", description: "Massive goethite–hematite gossan, jarosite on fractures." },
  { name: "Arroyo Pinar crossing", lat: 37.7206, lon: -6.6440, lithology: "shale", description: "Black shale with pyritic laminae, cleaved." },
  { name: "Old adit spoil (do not enter)", lat: 37.7297, lon: -6.5982, lithology: "massive sulfide", description: "Spoil heap below a collapsed adit; sampled from the heap only." },
  { name: "Rhyolite dome east", lat: 37.7125, lon: -6.5721, lithology: "rhyolite", description: "Flow-banded rhyolite with sericitic alteration halo." },
  { name: "Dacite tuff road cut", lat: 37.6984, lon: -6.6102, lithology: "dacite tuff", description: "Chloritised crystal tuff in a forestry road cut." },
  { name: "Jasper horizon", lat: 37.6903, lon: -6.6517, lithology: "jasper", description: "Red jasper and chert lenses at the volcanic–sediment contact." },
  { name: "Diabase dyke", lat: 37.7058, lon: -6.6861, lithology: "diabase", description: "Fine-grained dyke cutting shales, propylitic alteration." },
  { name: "Quarry face west", lat: 37.6810, lon: -6.7124, lithology: "shale", description: "Disused quarry; hard hat zone below the face." },
  { name: "Stream sediment A", lat: 37.6702, lon: -6.6355, lithology: "alluvium", description: "Active channel below the gossan ridge." },
  { name: "Stream sediment B", lat: 37.6625, lon: -6.5897, lithology: "alluvium", description: "Tributary draining the rhyolite dome." },
  { name: "Limestone lens", lat: 37.6531, lon: -6.5573, lithology: "limestone", description: "Thin marble/limestone lens with dolomitised margins." },
  { name: "Evaporite pan", lat: 37.6404, lon: -6.6081, lithology: "evaporite", description: "Gypsum-rich crust in a small salt pan." },
  { name: "Sericite schist", lat: 37.7523, lon: -6.5810, lithology: "schist", description: "Quartz–sericite schist with disseminated pyrite." },
  { name: "Hilltop rhyolite breccia", lat: 37.7634, lon: -6.6305, lithology: "rhyolite breccia", description: "Silicified hydrothermal breccia, kaolinite in matrix." },
];

export const ALTERATIONS = ["sericitic", "chloritic", "silicification", "argillic", "propylitic", "carbonatization", "hematization", null];
export const SAMPLE_TYPES_CYCLE = ["hand_sample", "hand_sample", "chip", "float", "soil", "stream_sediment"] as const;

/** mulberry32: tiny seeded PRNG so the demo is the same on every machine. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

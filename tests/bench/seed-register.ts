/**
 * Seeds a large invented register into the configured (temporary) database for benchmarks: stations on a
 * grid over the demo district, samples per station, and for most samples one scan with a finished run and
 * 4–6 phase results (about half signed off). Deterministic: no randomness.
 */
import { sql } from "drizzle-orm";
import { getDb } from "@/db";
import { organisations, phaseResults, processingRuns, projects, referencePhases, samples, scans, stations, user } from "@/db/schema";
import { LIBRARY_PHASES } from "@/lib/science/minerals";

const MINERALS = ["quartz", "pyrite", "chalcopyrite", "sphalerite", "galena", "goethite", "hematite", "kaolinite", "muscovite", "clinochlore", "calcite", "baryte", "gypsum", "jarosite", "albite"];

async function insertChunked<T>(rows: T[], size: number, insert: (chunk: T[]) => Promise<unknown>) {
  for (let i = 0; i < rows.length; i += size) await insert(rows.slice(i, i + size));
}

export interface SeededRegister {
  projectId: string;
  actor: { userId: string; name: string; email: string; isAdmin: boolean };
  samples: number;
  stations: number;
  scans: number;
  phaseResults: number;
}

/** Seeds `sampleCount` samples, 10 per station. */
export async function seedRegister(sampleCount: number): Promise<SeededRegister> {
  const db = getDb();
  await db.run(sql`PRAGMA journal_mode = WAL`);
  const [u] = await db.insert(user).values({ id: "bench-user", name: "Bench", email: "bench@example.test", role: "admin" }).returning();
  const [org] = await db.insert(organisations).values({ name: "Bench org" }).returning();
  const [project] = await db.insert(projects).values({ organisationId: org.id, code: "BEN", name: "Bench project (invented)", region: "Huelva, Spain" }).returning();
  const refs = new Map<string, string>();
  for (const m of MINERALS) {
    const p = LIBRARY_PHASES.find((x) => x.mineral === m)!;
    const [r] = await db
      .insert(referencePhases)
      .values({ mineral: p.mineral, formula: p.formula, mineralGroup: p.group, crystalSystem: p.crystalSystem, spaceGroup: p.spaceGroup ?? "?", cellA: p.cell.a, cellB: p.cell.b, cellC: p.cell.c, cellAlpha: p.cell.alpha, cellBeta: p.cell.beta, cellGamma: p.cell.gamma, elements: p.elements.join(","), citation: p.citation || p.source, cifText: "", patternJson: [], rir: p.rir, builtin: true })
      .returning({ id: referencePhases.id });
    refs.set(m, r.id);
  }
  const nStations = Math.ceil(sampleCount / 10);
  const stationRows = Array.from({ length: nStations }, (_, i) => ({
    id: `st-${i}`,
    projectId: project.id,
    code: `BEN-ST-${String(i + 1).padStart(5, "0")}`,
    lat: 37.58 + (i % 50) * 0.004,
    lon: -6.78 + Math.floor(i / 50) * 0.0009,
    lithology: ["rhyolite", "shale", "gossan", "tuff"][i % 4],
  }));
  await insertChunked(stationRows, 500, (c) => db.insert(stations).values(c));
  const sampleRows = Array.from({ length: sampleCount }, (_, i) => ({
    id: `sa-${i}`,
    projectId: project.id,
    code: `BEN-${String(i + 1).padStart(6, "0")}`,
    stationId: `st-${Math.floor(i / 10)}`,
    sampleType: (["hand_sample", "chip", "soil", "stream_sediment"] as const)[i % 4],
    lithology: ["rhyolite", "shale", "gossan", "tuff"][Math.floor(i / 10) % 4],
    alteration: i % 3 ? "sericitic" : null,
    description: `Bench sample ${i + 1}, invented.`,
    collectedAt: new Date(Date.UTC(2026, 2, 1 + (i % 60), 9, i % 60)).toISOString(),
    collectedTz: "Europe/Madrid",
    collectorName: ["A. Geologist", "B. Geologist"][i % 2],
    lat: i % 5 === 0 ? null : 37.58 + ((i * 7) % 200) * 0.001,
    lon: i % 5 === 0 ? null : -6.78 + ((i * 13) % 360) * 0.001,
    elevationM: 100 + (i % 300),
    status: "collected" as const,
    weightKg: 0.5 + (i % 20) * 0.1,
  }));
  await insertChunked(sampleRows, 500, (c) => db.insert(samples).values(c));
  // 80 % of samples have a scan; even ones signed off.
  const scanRows: (typeof scans.$inferInsert)[] = [];
  const runRows: (typeof processingRuns.$inferInsert)[] = [];
  const prRows: (typeof phaseResults.$inferInsert)[] = [];
  for (let i = 0; i < sampleCount; i++) {
    if (i % 5 === 4) continue;
    const signed = i % 2 === 0;
    scanRows.push({ id: `sc-${i}`, projectId: project.id, sampleId: `sa-${i}`, fileKey: `bench/${i}.xy`, originalName: `BEN-${i}.xy`, sha256: "0".repeat(64), format: "xy", anode: "Cu", wavelengthA: 1.540593, status: signed ? "signed_off" : "processed", currentRunId: `run-${i}` });
    runRows.push({ id: `run-${i}`, scanId: `sc-${i}`, paramsJson: { background: { method: "snip", iterations: 24 } }, softwareVersion: "bench", status: "done" });
    const n = 4 + (i % 3);
    let left = 100;
    for (let k = 0; k < n; k++) {
      const mineral = MINERALS[(i * 3 + k * 5) % MINERALS.length];
      const wt = k === n - 1 ? left : Math.round(left * 0.5);
      left -= wt;
      prRows.push({ id: `pr-${i}-${k}`, runId: `run-${i}`, scanId: `sc-${i}`, referencePhaseId: refs.get(mineral)!, rank: k + 1, score: 1 / (k + 1), wtPercent: signed && k < 3 ? wt : null, status: signed ? (k < 3 ? "accepted" : "candidate") : k === 3 ? "rejected" : "candidate", source: "auto" });
    }
  }
  await insertChunked(scanRows, 500, (c) => db.insert(scans).values(c));
  await insertChunked(runRows, 500, (c) => db.insert(processingRuns).values(c));
  await insertChunked(prRows, 500, (c) => db.insert(phaseResults).values(c));
  await db.run(sql`ANALYZE`);
  return { projectId: project.id, actor: { userId: u.id, name: u.name, email: u.email, isAdmin: true }, samples: sampleCount, stations: nStations, scans: scanRows.length, phaseResults: prRows.length };
}

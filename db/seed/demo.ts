import { fileURLToPath } from "node:url";
import { and, count, eq, inArray, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { migrateDatabase } from "@/db/migrate";
import { custodyEvents, organisations, projectMembers, projects, samples, stations, structures, submissionSamples, submissions } from "@/db/schema";
import { createUserWithPassword } from "@/lib/users";
import { DEMO_SCANS, seedDemoScans } from "./demo-scans";
import { seedReferenceLibrary } from "./reference-library";
import { ALTERATIONS, DEMO_OTHER_PROJECT, DEMO_PASSWORD_NOTE, DEMO_PROJECT, DEMO_STATIONS, DEMO_USERS, SAMPLE_TYPES_CYCLE, seededRandom } from "./scenario";

/** Loads the demo scenario into an empty database. Returns false when data exists already. */
export async function seedDemo(): Promise<boolean> {
  const db = getDb();
  await seedReferenceLibrary(); // idempotent: shipped minerals are refreshed even when the demo exists
  const [{ n }] = await db.select({ n: count() }).from(projects);
  if (n > 0) return false;
  const rand = seededRandom(20260314);
  const users: Record<string, { id: string; name: string }> = {};
  for (const u of DEMO_USERS) {
    const made = await createUserWithPassword({ email: u.email, name: u.name, password: u.password, siteRole: u.siteRole ?? "user" });
    users[u.key] = { id: made.id, name: u.name };
  }
  await db.transaction(async (tx) => {
    const [org] = await tx.insert(organisations).values({ name: "Meseta Minerals S.L. (invented)" }).returning();
    const [project] = await tx
      .insert(projects)
      .values({ organisationId: org.id, code: DEMO_PROJECT.code, name: DEMO_PROJECT.name, region: DEMO_PROJECT.region, description: DEMO_PROJECT.description, labEmail: DEMO_PROJECT.labEmail, timeZone: "Europe/Madrid" })
      .returning();
    const [other] = await tx.insert(projects).values({ organisationId: org.id, code: DEMO_OTHER_PROJECT.code, name: DEMO_OTHER_PROJECT.name, region: DEMO_OTHER_PROJECT.region }).returning();
    for (const u of DEMO_USERS) if (u.role) await tx.insert(projectMembers).values({ projectId: project.id, userId: users[u.key].id, role: u.role });
    // Only the second field geologist works on the other project: the lead must not see it.
    await tx.insert(projectMembers).values({ projectId: other.id, userId: users.field2.id, role: "lead" });

    const collectors = [users.field, users.field2];
    let seq = 0;
    for (const [i, st] of DEMO_STATIONS.entries()) {
      const collector = collectors[i % 2];
      const day = new Date(Date.UTC(2026, 2, 9 + Math.floor(i / 3), 8 + (i % 3) * 2, Math.floor(rand() * 60)));
      const [station] = await tx
        .insert(stations)
        .values({
          projectId: project.id,
          code: `${DEMO_PROJECT.code}-ST-${String(i + 1).padStart(3, "0")}`,
          name: st.name,
          lat: st.lat,
          lon: st.lon,
          elevationM: Math.round(180 + rand() * 220),
          elevationRef: "msl",
          horizontalAccuracyM: Math.round(3 + rand() * 6),
          locationSource: "device_gnss",
          lithology: st.lithology,
          description: st.description,
          observedAt: day.toISOString(),
          createdBy: collector.id,
        })
        .returning();
      await tx.insert(structures).values({
        stationId: station.id,
        kind: "planar",
        feature: i % 3 === 0 ? "bedding" : "foliation",
        dipDirection: Math.round(170 + rand() * 40) % 360,
        dip: Math.round(45 + rand() * 30),
        convention: "rhr",
        createdBy: collector.id,
      });
      const nSamples = 4;
      for (let k = 0; k < nSamples; k++) {
        seq++;
        const type = st.lithology === "alluvium" ? "stream_sediment" : SAMPLE_TYPES_CYCLE[(i + k) % SAMPLE_TYPES_CYCLE.length];
        const at = new Date(day.getTime() + k * 17 * 60_000);
        const [sample] = await tx
          .insert(samples)
          .values({
            projectId: project.id,
            code: `${DEMO_PROJECT.code}-${String(seq).padStart(6, "0")}`,
            stationId: station.id,
            sampleType: type,
            lithology: st.lithology,
            alteration: ALTERATIONS[Math.floor(rand() * ALTERATIONS.length)],
            alterationIntensity: (["weak", "moderate", "strong"] as const)[Math.floor(rand() * 3)],
            description: `${st.lithology[0].toUpperCase()}${st.lithology.slice(1)}, ${type.replace("_", " ")} ${k + 1} at ${st.name}.`,
            collectedAt: at.toISOString(),
            collectedTz: "Europe/Madrid",
            collectorName: collector.name,
            collectorId: collector.id,
            lat: +(st.lat + (rand() - 0.5) * 0.0008).toFixed(6),
            lon: +(st.lon + (rand() - 0.5) * 0.0008).toFixed(6),
            elevationM: Math.round(180 + rand() * 220),
            horizontalAccuracyM: Math.round(3 + rand() * 6),
            locationSource: "device_gnss",
            storageLocation: "Camp store, rack B",
            status: "collected",
            suspectedAsbestos: st.lithology === "diabase" && k === 0,
            weightKg: +(0.5 + rand() * 2).toFixed(2),
            createdBy: collector.id,
          })
          .returning();
        await tx.insert(custodyEvents).values({ sampleId: sample.id, event: "collected", actorId: collector.id, actorName: collector.name, occurredAt: at.toISOString(), location: st.name, statusAfter: "collected" });
      }
    }
    await tx.update(projects).set({ sampleSeq: seq, stationSeq: DEMO_STATIONS.length }).where(eq(projects.id, project.id));
  });
  await seedDemoSubmission(users);
  await seedDemoScans(DEMO_PROJECT.code);
  return true;
}

/** Samples of the demo batch that reached the lab but have no scan yet (browser tests upload scans for them). */
export const AT_LAB_UNSCANNED = ["APR-000033", "APR-000037", "APR-000041"];

/**
 * The batch that brought the demo's scanned samples to the lab (invented): submission APR-SUB-0001, dispatched by the
 * field geologist on 2026-03-17 and received by the lab analyst on 2026-03-19, with a custody event per sample for
 * each step — so every scan below rests on a recorded intake.
 */
async function seedDemoSubmission(users: Record<string, { id: string; name: string }>) {
  const db = getDb();
  const [project] = await db.select({ id: projects.id }).from(projects).where(eq(projects.code, DEMO_PROJECT.code));
  const list = await db.select({ id: samples.id, code: samples.code, suspectedAsbestos: samples.suspectedAsbestos }).from(samples).where(and(eq(samples.projectId, project.id), inArray(samples.code, [...DEMO_SCANS.map((p) => p.code), ...AT_LAB_UNSCANNED])));
  const sentAt = new Date(Date.UTC(2026, 2, 17, 15, 30));
  const receivedAt = new Date(Date.UTC(2026, 2, 19, 9, 10));
  await db.transaction(async (tx) => {
    const [sub] = await tx
      .insert(submissions)
      .values({
        projectId: project.id,
        code: `${DEMO_PROJECT.code}-SUB-0001`,
        requestedAnalysis: "XRD bulk",
        priority: "routine",
        hazards: list.some((s) => s.suspectedAsbestos) ? `Suspected asbestos (flagged at collection): ${list.filter((s) => s.suspectedAsbestos).map((s) => s.code).sort().join(", ")}` : null,
        labEmail: DEMO_PROJECT.labEmail,
        status: "in_progress",
        waybill: "WB-DEMO-0317",
        labReference: "LAB-26-0042",
        sentAt,
        sentBy: users.field.id,
        lastMailedAt: sentAt,
        mailCount: 1,
        receivedAt,
        createdBy: users.field.id,
        createdAt: new Date(sentAt.getTime() - 3600_000),
      })
      .returning();
    await tx.insert(submissionSamples).values(list.map((s) => ({ submissionId: sub.id, sampleId: s.id, intakeCondition: "received" })));
    for (const s of list) {
      await tx.insert(custodyEvents).values([
        { sampleId: s.id, submissionId: sub.id, event: "dispatched", actorId: users.field.id, actorName: users.field.name, occurredAt: sentAt.toISOString(), location: "Camp store, rack B", waybill: "WB-DEMO-0317", handedTo: "Courier", statusAfter: "dispatched" },
        { sampleId: s.id, submissionId: sub.id, event: "received", actorId: users.lab.id, actorName: users.lab.name, occurredAt: receivedAt.toISOString(), location: "Lab reception, shelf R1", condition: "received", statusAfter: "received" },
      ]);
      await tx.update(samples).set({ status: "received", storageLocation: "Lab reception, shelf R1", version: 3 }).where(eq(samples.id, s.id));
    }
    await tx.update(projects).set({ submissionSeq: 1 }).where(eq(projects.id, project.id));
  });
}

export function printDemoAccounts(baseUrl = process.env.BETTER_AUTH_URL || "http://localhost:3000") {
  console.log(`\nLithodex demo is at ${baseUrl}\n${DEMO_PASSWORD_NOTE}`);
  for (const u of DEMO_USERS) console.log(`  ${(u.role ?? "site admin").padEnd(16)} ${u.email.padEnd(30)} ${u.password}`);
  console.log("");
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  (async () => {
    await migrateDatabase();
    const seeded = await seedDemo();
    console.log(seeded ? "Demo scenario loaded." : "Database already has data; demo not reloaded (use npm run db:reset).");
    const [{ n }] = await getDb().select({ n: sql<number>`count(*)` }).from(samples);
    console.log(`${n} samples in the database.`);
    printDemoAccounts();
  })().catch((err) => {
    console.error(err);
    process.exit(1);
  });
}

import "server-only";
import { and, asc, count, eq, inArray, isNull, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { projects, reservedSampleCodes, sampleCodeBlocks, samples, user } from "@/db/schema";
import { CODE_BLOCK_MAX_UNUSED } from "@/lib/outbox/code-block-math";
import { codeBlockReserveSchema, deviceId as deviceIdSchema } from "@/lib/validation/code-block";
import { formatCodeFromPattern } from "@/lib/validation/project";
import { authorize, type Actor } from "./actor";
import { audit, type DbOrTx } from "./audit";
import { AppError, invalid } from "./errors";
import { createOnce, idempotencyFor } from "./idempotency";
import { validateInput } from "./validate";

/**
 * Per-device blocks of reserved sample codes. A device reserves a block while online; samples it takes offline get
 * the next code of its block, so labels printed in the field keep their code. Reserving advances the project's
 * sample sequence past the block, so the server's generator never issues a reserved code; a reserved code is
 * accepted on create only from the account (and device) it was reserved for.
 */

export interface CodeBlock {
  id: string;
  deviceId: string;
  deviceLabel: string | null;
  firstCode: string;
  lastCode: string;
  size: number;
  codes: string[];
  /** Codes of the block the server has seen on a sample. */
  used: number;
  createdAt: Date;
}

/** True when `code` is already a sample's code or reserved in the project. */
async function codeTaken(db: DbOrTx, projectId: string, code: string): Promise<boolean> {
  const [r] = await db.select({ n: count() }).from(reservedSampleCodes).where(and(eq(reservedSampleCodes.projectId, projectId), eq(reservedSampleCodes.code, code)));
  if (r.n > 0) return true;
  const [s] = await db.select({ n: count() }).from(samples).where(and(eq(samples.projectId, projectId), eq(samples.code, code)));
  return s.n > 0;
}

/**
 * The next code from the project sequence that is neither reserved for a device nor already a sample's code
 * (e.g. a pre-printed tag typed earlier). Call inside the create's transaction.
 */
export async function nextFreeSampleCode(tx: DbOrTx, projectId: string, projectCode: string): Promise<string> {
  for (let guard = 0; guard < 10_000; guard++) {
    const [p] = await tx
      .update(projects)
      .set({ sampleSeq: sql`${projects.sampleSeq} + 1` })
      .where(eq(projects.id, projectId))
      .returning({ seq: projects.sampleSeq, pattern: projects.sampleCodePattern });
    const code = formatCodeFromPattern(p.pattern, projectCode, p.seq);
    if (!(await codeTaken(tx, projectId, code))) return code;
  }
  throw new AppError("internal", "No free sample code found in the project sequence.");
}

/**
 * Checks a code given on create (or edit) against the reservations: a code reserved for another account, or for
 * another device of the same account, is refused with the block it belongs to. When `claim` is given, the
 * reservation is marked used by that sample (inside the create's transaction).
 */
export async function checkReservedCode(
  tx: DbOrTx,
  actor: Actor,
  projectId: string,
  code: string,
  device: string | null,
  claim?: { sampleId: string },
): Promise<void> {
  const [r] = await tx
    .select({
      blockId: reservedSampleCodes.blockId,
      userId: sampleCodeBlocks.userId,
      deviceId: sampleCodeBlocks.deviceId,
      deviceLabel: sampleCodeBlocks.deviceLabel,
      firstCode: sampleCodeBlocks.firstCode,
      lastCode: sampleCodeBlocks.lastCode,
      userName: user.name,
    })
    .from(reservedSampleCodes)
    .innerJoin(sampleCodeBlocks, eq(sampleCodeBlocks.id, reservedSampleCodes.blockId))
    .leftJoin(user, eq(user.id, sampleCodeBlocks.userId))
    .where(and(eq(reservedSampleCodes.projectId, projectId), eq(reservedSampleCodes.code, code)));
  if (!r) return;
  const otherAccount = r.userId !== actor.userId;
  const otherDevice = !otherAccount && device != null && device !== r.deviceId;
  if (otherAccount || otherDevice) {
    const holder = otherAccount ? `${r.userName ?? "another member"}'s` : "your other";
    const msg = `Sample code ${code} is reserved for ${holder} device${r.deviceLabel ? ` (${r.deviceLabel})` : ""}, block ${r.firstCode}–${r.lastCode}; only that device can use it. Use the next code of this device's block, or leave the code empty for the server to issue one.`;
    throw invalid(msg, { code: [msg] });
  }
  if (claim) {
    await tx
      .update(reservedSampleCodes)
      .set({ sampleId: claim.sampleId, usedAt: new Date() })
      .where(and(eq(reservedSampleCodes.projectId, projectId), eq(reservedSampleCodes.code, code), isNull(reservedSampleCodes.sampleId)));
  }
}

async function blockView(db: DbOrTx, rows: (typeof sampleCodeBlocks.$inferSelect)[]): Promise<CodeBlock[]> {
  if (rows.length === 0) return [];
  const codes = await db
    .select({ blockId: reservedSampleCodes.blockId, code: reservedSampleCodes.code, sampleId: reservedSampleCodes.sampleId })
    .from(reservedSampleCodes)
    .where(inArray(reservedSampleCodes.blockId, rows.map((r) => r.id)))
    .orderBy(asc(reservedSampleCodes.seq));
  return rows.map((b) => {
    const mine = codes.filter((c) => c.blockId === b.id);
    return {
      id: b.id,
      deviceId: b.deviceId,
      deviceLabel: b.deviceLabel,
      firstCode: b.firstCode,
      lastCode: b.lastCode,
      size: b.size,
      codes: mine.map((c) => c.code),
      used: mine.filter((c) => c.sampleId).length,
      createdAt: b.createdAt,
    };
  });
}

/**
 * Reserves the next `size` free codes of the project sequence for the caller's device (lead, field geologist).
 * Replay-safe with an Idempotency-Key: a device that lost the answer gets the same block again.
 */
export async function reserveCodeBlock(actor: Actor, projectId: string, raw: unknown, opts: { idempotencyKey?: string | null } = {}): Promise<CodeBlock> {
  const access = await authorize(actor, projectId, "sample.write");
  const input = validateInput(codeBlockReserveSchema, raw);
  const db = getDb();
  const idem = idempotencyFor(projectId, "code-block.reserve", opts.idempotencyKey, null, input);
  return createOnce<CodeBlock>(db, actor, idem, "sample_code_blocks.id", "code block", (remember) =>
    db.transaction(async (tx) => {
      const [{ unused }] = await tx
        .select({ unused: count() })
        .from(reservedSampleCodes)
        .innerJoin(sampleCodeBlocks, eq(sampleCodeBlocks.id, reservedSampleCodes.blockId))
        .where(and(eq(sampleCodeBlocks.projectId, projectId), eq(sampleCodeBlocks.deviceId, input.deviceId), eq(sampleCodeBlocks.userId, actor.userId), isNull(reservedSampleCodes.sampleId)));
      if (unused + input.size > CODE_BLOCK_MAX_UNUSED) {
        const msg = `This device already holds ${unused} unused reserved codes; use them first (at most ${CODE_BLOCK_MAX_UNUSED} unused codes per device).`;
        throw invalid(msg, { size: [msg] });
      }
      const picked: { code: string; seq: number }[] = [];
      // The sequence is advanced one code at a time, skipping codes already taken (typed tags, other blocks).
      while (picked.length < input.size) {
        const [p] = await tx
          .update(projects)
          .set({ sampleSeq: sql`${projects.sampleSeq} + 1` })
          .where(eq(projects.id, projectId))
          .returning({ seq: projects.sampleSeq, pattern: projects.sampleCodePattern });
        const code = formatCodeFromPattern(p.pattern, access.projectCode, p.seq);
        if (!(await codeTaken(tx, projectId, code))) picked.push({ code, seq: p.seq });
      }
      const [block] = await tx
        .insert(sampleCodeBlocks)
        .values({
          projectId,
          deviceId: input.deviceId,
          deviceLabel: input.deviceLabel ?? null,
          userId: actor.userId,
          firstSeq: picked[0].seq,
          lastSeq: picked[picked.length - 1].seq,
          firstCode: picked[0].code,
          lastCode: picked[picked.length - 1].code,
          size: picked.length,
        })
        .returning();
      await tx.insert(reservedSampleCodes).values(picked.map((c) => ({ projectId, code: c.code, seq: c.seq, blockId: block.id })));
      await audit(tx, actor, { projectId, action: "create", entity: "sample_code_block", entityId: block.id, after: block });
      const [view] = await blockView(tx, [block]);
      await remember(tx, view);
      return view;
    }),
  );
}

/** The caller's blocks for one device, oldest first, with the codes the server has seen used. */
export async function listCodeBlocks(actor: Actor, projectId: string, device: unknown): Promise<CodeBlock[]> {
  await authorize(actor, projectId, "sample.write");
  const id = validateInput(deviceIdSchema, device);
  const db = getDb();
  const rows = await db
    .select()
    .from(sampleCodeBlocks)
    .where(and(eq(sampleCodeBlocks.projectId, projectId), eq(sampleCodeBlocks.deviceId, id), eq(sampleCodeBlocks.userId, actor.userId)))
    .orderBy(asc(sampleCodeBlocks.createdAt), asc(sampleCodeBlocks.firstSeq));
  return blockView(db, rows);
}

/**
 * An import's typed codes against the reservations: codes reserved for another account are refused all together
 * (nothing is written); the importer's own reserved codes are marked used by their samples.
 */
export async function checkReservedCodesForImport(tx: DbOrTx, actor: Actor, projectId: string, rows: { code: string; sampleId: string }[]): Promise<void> {
  if (rows.length === 0) return;
  const byCode = new Map(rows.map((r) => [r.code, r.sampleId]));
  const hits: { code: string; userId: string; firstCode: string; lastCode: string }[] = [];
  const codes = [...byCode.keys()];
  for (let i = 0; i < codes.length; i += 500) {
    hits.push(
      ...(await tx
        .select({ code: reservedSampleCodes.code, userId: sampleCodeBlocks.userId, firstCode: sampleCodeBlocks.firstCode, lastCode: sampleCodeBlocks.lastCode })
        .from(reservedSampleCodes)
        .innerJoin(sampleCodeBlocks, eq(sampleCodeBlocks.id, reservedSampleCodes.blockId))
        .where(and(eq(reservedSampleCodes.projectId, projectId), inArray(reservedSampleCodes.code, codes.slice(i, i + 500))))),
    );
  }
  const others = hits.filter((h) => h.userId !== actor.userId);
  if (others.length > 0) {
    const list = others.slice(0, 10).map((h) => `${h.code} (block ${h.firstCode}–${h.lastCode})`).join(", ");
    throw invalid(`${others.length} code${others.length === 1 ? " in the file is" : "s in the file are"} reserved for another member's device: ${list}${others.length > 10 ? ", …" : ""}. Nothing was imported.`, { code: [`Reserved for another device: ${list}`] });
  }
  for (const h of hits) {
    await tx
      .update(reservedSampleCodes)
      .set({ sampleId: byCode.get(h.code)!, usedAt: new Date() })
      .where(and(eq(reservedSampleCodes.projectId, projectId), eq(reservedSampleCodes.code, h.code), isNull(reservedSampleCodes.sampleId)));
  }
}

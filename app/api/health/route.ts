import { NextResponse } from "next/server";
import { getClient } from "@/db";

export const dynamic = "force-dynamic";

// GET /api/health — reports whether the database answers (no sign-in needed).
export async function GET() {
  const started = performance.now();
  try {
    await getClient().execute("select 1");
    return NextResponse.json({ status: "ok", database: "reachable", latencyMs: Math.round(performance.now() - started) });
  } catch (err) {
    return NextResponse.json(
      { status: "error", database: "unreachable", error: { code: "internal", message: String((err as Error).message) } },
      { status: 503 },
    );
  }
}

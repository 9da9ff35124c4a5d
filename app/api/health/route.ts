// GET /api/health: liveness for the start script and load balancers; says whether the database answers.
import { sql } from "drizzle-orm";
import { getDb } from "@/db/client";

export const dynamic = "force-dynamic";

export async function GET() {
  try {
    await getDb().execute(sql`SELECT 1`);
    return Response.json({ ok: true, database: "up" }, { headers: { "cache-control": "no-store" } });
  } catch {
    return Response.json({ ok: false, database: "down" }, { status: 503, headers: { "cache-control": "no-store", "retry-after": "5" } });
  }
}

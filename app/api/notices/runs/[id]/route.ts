// GET /api/notices/runs/:id: one run's progress, counts and log (polled by the notices page).
import { z } from "zod";
import { getNoticeRun } from "@/lib/data/notices-log";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const GET = apiRoute({ permission: "notices.view" }, async ({ actor, params }) => {
  const id = parseOrThrow(z.coerce.number().int().positive(), params.id);
  return { run: await getNoticeRun(actor, id) };
});

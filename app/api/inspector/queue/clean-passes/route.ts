// GET /api/inspector/queue/clean-passes: the clean passing reports in a filter — the exact list "accept all clean passes" confirms.
import { listCleanPassIds, queueFilterSchema } from "@/lib/data/review-queue";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const GET = apiRoute({ permission: "reports.review" }, async ({ actor, searchParams }) => {
  const filter = parseOrThrow(queueFilterSchema, Object.fromEntries(searchParams));
  return listCleanPassIds(actor, filter);
});

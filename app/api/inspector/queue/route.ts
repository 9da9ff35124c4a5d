// GET /api/inspector/queue: one page of the program's review queue (filters, sort, keyset cursor).
import { listReviewQueue, queuePageSchema } from "@/lib/data/review-queue";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const GET = apiRoute({ permission: "reports.review" }, async ({ actor, searchParams }) => {
  const query = parseOrThrow(queuePageSchema, Object.fromEntries(searchParams));
  return listReviewQueue(actor, query);
});

// POST /api/inspector/reports/accept-clean: accepts one batch (≤ 200) of the clean passes the inspector confirmed.
import { acceptCleanPasses, batchAcceptSchema } from "@/lib/data/review-decisions";
import { apiRoute } from "@/lib/http/route";

export const POST = apiRoute({ permission: "reports.review", body: batchAcceptSchema, maxBodyBytes: 32 * 1024 }, async ({ actor, body }) => acceptCleanPasses(actor, body.ids));

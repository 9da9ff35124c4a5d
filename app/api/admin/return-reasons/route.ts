// POST /api/admin/return-reasons: adds a reason inspectors can pick when returning a report.
import { createReturnReason, returnReasonSchema } from "@/lib/data/settings";
import { apiRoute } from "@/lib/http/route";

export const POST = apiRoute({ permission: "settings.manage", body: returnReasonSchema, maxBodyBytes: 8 * 1024 }, async ({ actor, body }) => createReturnReason(actor, body));

// POST /api/testers/:approvalId/decision: approve, reject, suspend or reinstate a tester in the inspector's program.
import { z } from "zod";
import { decideTesterApproval, testerDecisionSchema } from "@/lib/data/testers";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const POST = apiRoute({ permission: "testers.review", body: testerDecisionSchema.omit({ approvalId: true }), maxBodyBytes: 8 * 1024 }, async ({ actor, body, params }) => {
  const approvalId = parseOrThrow(z.coerce.number().int().positive(), params.approvalId);
  await decideTesterApproval(actor, { ...body, approvalId });
  return { ok: true };
});

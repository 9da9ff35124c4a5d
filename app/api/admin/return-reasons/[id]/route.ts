// PATCH /api/admin/return-reasons/:id: rewords, retires, restores or moves a return reason (reasons are never deleted).
import { z } from "zod";
import { returnReasonSchema, updateReturnReason } from "@/lib/data/settings";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

const bodySchema = returnReasonSchema.extend({ move: z.enum(["up", "down"]).optional() });

export const PATCH = apiRoute({ permission: "settings.manage", body: bodySchema, maxBodyBytes: 8 * 1024 }, async ({ actor, body, params }) => {
  await updateReturnReason(actor, parseOrThrow(z.coerce.number().int().positive("No such reason."), params.id), body);
  return { ok: true };
});

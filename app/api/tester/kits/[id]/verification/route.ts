// POST /api/tester/kits/:id/verification: records a new accuracy check of one of the tester's kits.
import { z } from "zod";
import { kitVerificationSchema, recordKitVerification } from "@/lib/data/tester-credentials";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const POST = apiRoute({ permission: "credentials.manage", body: kitVerificationSchema, maxBodyBytes: 8 * 1024 }, async ({ actor, body, params }) => {
  const id = parseOrThrow(z.coerce.number().int().positive(), params.id);
  await recordKitVerification(actor, id, body);
  return { ok: true };
});

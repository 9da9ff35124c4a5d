// PATCH /api/tester/certifications/:id: attaches the uploaded copy of one of the tester's certificates.
import { z } from "zod";
import { attachCertificationDocument, certificationUpdateSchema } from "@/lib/data/tester-credentials";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const PATCH = apiRoute({ permission: "credentials.manage", body: certificationUpdateSchema, maxBodyBytes: 4 * 1024 }, async ({ actor, body, params }) => {
  const id = parseOrThrow(z.coerce.number().int().positive(), params.id);
  await attachCertificationDocument(actor, id, body);
  return { ok: true };
});

// POST /api/tester/kits/:id/retire: takes one of the tester's kits out of service.
import { z } from "zod";
import { retireKit } from "@/lib/data/tester-credentials";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const POST = apiRoute({ permission: "credentials.manage" }, async ({ actor, params }) => {
  const id = parseOrThrow(z.coerce.number().int().positive(), params.id);
  await retireKit(actor, id);
  return { ok: true };
});

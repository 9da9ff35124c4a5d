// PATCH /api/inspector/owners/:id: edits an owner's contact details.
import { z } from "zod";
import { ownerSchema, updateOwner } from "@/lib/data/inventory-owners";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const PATCH = apiRoute({ permission: "inventory.manage", body: ownerSchema, maxBodyBytes: 8 * 1024 }, async ({ actor, body, params }) => {
  await updateOwner(actor, parseOrThrow(z.coerce.number().int().positive("No such owner."), params.id), body);
  return { ok: true };
});

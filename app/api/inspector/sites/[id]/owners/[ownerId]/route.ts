// PATCH /api/inspector/sites/:id/owners/:ownerId: changes a site contact's role or notices, or removes it from the site.
import { z } from "zod";
import { siteOwnerLinkSchema, updateSiteOwnerLink } from "@/lib/data/inventory-sites";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

const idSchema = z.coerce.number().int().positive("Not found.");

export const PATCH = apiRoute({ permission: "inventory.manage", body: siteOwnerLinkSchema, maxBodyBytes: 4 * 1024 }, async ({ actor, body, params }) => {
  await updateSiteOwnerLink(actor, parseOrThrow(idSchema, params.id), parseOrThrow(idSchema, params.ownerId), body);
  return { ok: true };
});

// POST /api/inspector/sites/:id/owners: adds an owner or manager contact to a site.
import { z } from "zod";
import { addSiteOwner, siteOwnerSchema } from "@/lib/data/inventory-sites";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const POST = apiRoute({ permission: "inventory.manage", body: siteOwnerSchema, maxBodyBytes: 8 * 1024 }, async ({ actor, body, params }) => {
  const id = parseOrThrow(z.coerce.number().int().positive("No such site."), params.id);
  return addSiteOwner(actor, id, body);
});

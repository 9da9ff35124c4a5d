// PATCH /api/inspector/sites/:id: edits a site (a new hazard is passed to its assemblies unless asked not to).
import { z } from "zod";
import { siteSchema, updateSite } from "@/lib/data/inventory-sites";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const PATCH = apiRoute({ permission: "inventory.manage", body: siteSchema, maxBodyBytes: 16 * 1024 }, async ({ actor, body, params }) => {
  const id = parseOrThrow(z.coerce.number().int().positive("No such site."), params.id);
  return updateSite(actor, id, body);
});

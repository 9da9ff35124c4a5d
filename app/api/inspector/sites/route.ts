// POST /api/inspector/sites: adds a site to the program's inventory.
import { createSite, siteSchema } from "@/lib/data/inventory-sites";
import { apiRoute } from "@/lib/http/route";

export const POST = apiRoute({ permission: "inventory.manage", body: siteSchema, maxBodyBytes: 16 * 1024 }, async ({ actor, body }) => createSite(actor, body));

// POST /api/inspector/sites/:id/assemblies: adds an assembly to a site.
import { z } from "zod";
import { assemblySchema, createAssembly } from "@/lib/data/inventory-assemblies";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const POST = apiRoute({ permission: "inventory.manage", body: assemblySchema, maxBodyBytes: 16 * 1024 }, async ({ actor, body, params }) => {
  const id = parseOrThrow(z.coerce.number().int().positive("No such site."), params.id);
  return createAssembly(actor, id, body);
});

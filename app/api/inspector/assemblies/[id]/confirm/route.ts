// POST /api/inspector/assemblies/:id/confirm: confirms a tester's field registration, with corrections.
import { z } from "zod";
import { assemblySchema, confirmAssembly } from "@/lib/data/inventory-assemblies";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const POST = apiRoute({ permission: "inventory.manage", body: assemblySchema, maxBodyBytes: 16 * 1024 }, async ({ actor, body, params }) => {
  await confirmAssembly(actor, parseOrThrow(z.coerce.number().int().positive("No such assembly."), params.id), body);
  return { ok: true };
});

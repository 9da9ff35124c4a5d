// PATCH /api/inspector/assemblies/:id: edits an assembly's record (its due dates are recomputed).
import { z } from "zod";
import { assemblySchema, updateAssembly } from "@/lib/data/inventory-assemblies";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const PATCH = apiRoute({ permission: "inventory.manage", body: assemblySchema, maxBodyBytes: 16 * 1024 }, async ({ actor, body, params }) => {
  await updateAssembly(actor, parseOrThrow(z.coerce.number().int().positive("No such assembly."), params.id), body);
  return { ok: true };
});

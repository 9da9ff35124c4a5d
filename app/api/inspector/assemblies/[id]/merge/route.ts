// POST /api/inspector/assemblies/:id/merge: merges a field registration into the assembly already on file (its reports move there).
import { z } from "zod";
import { mergeAssembly, mergeSchema } from "@/lib/data/inventory-assemblies";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const POST = apiRoute({ permission: "inventory.manage", body: mergeSchema, maxBodyBytes: 4 * 1024 }, async ({ actor, body, params }) => mergeAssembly(actor, parseOrThrow(z.coerce.number().int().positive("No such assembly."), params.id), body.targetId));

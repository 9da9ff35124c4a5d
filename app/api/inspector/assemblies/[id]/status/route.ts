// POST /api/inspector/assemblies/:id/status: marks an assembly removed or replaced (its history stays), or back in service.
import { z } from "zod";
import { assemblyStatusSchema, changeAssemblyStatus } from "@/lib/data/inventory-assemblies";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const POST = apiRoute({ permission: "inventory.manage", body: assemblyStatusSchema, maxBodyBytes: 16 * 1024 }, async ({ actor, body, params }) => changeAssemblyStatus(actor, parseOrThrow(z.coerce.number().int().positive("No such assembly."), params.id), body));

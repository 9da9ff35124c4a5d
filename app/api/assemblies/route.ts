// POST /api/assemblies: a tester registers a newly installed assembly from the field (awaiting the inspector's confirmation).
import { assemblyRegistrationSchema, registerAssemblyFromField } from "@/lib/data/assemblies-search";
import { apiRoute, jsonResponse } from "@/lib/http/route";

export const POST = apiRoute({ permission: "assemblies.register", body: assemblyRegistrationSchema, maxBodyBytes: 8 * 1024 }, async ({ actor, body }) => jsonResponse(await registerAssemblyFromField(actor, body), { status: 201 }));

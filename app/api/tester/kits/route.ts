// POST /api/tester/kits: adds a test kit (differential gauge) with its last accuracy check.
import { addKit, kitSchema } from "@/lib/data/tester-credentials";
import { apiRoute, jsonResponse } from "@/lib/http/route";

export const POST = apiRoute({ permission: "credentials.manage", body: kitSchema, maxBodyBytes: 8 * 1024 }, async ({ actor, body }) => jsonResponse(await addKit(actor, body), { status: 201 }));

// POST /api/tester/certifications: adds the tester's current (e.g. renewed) certification, with its uploaded copy.
import { addCertification, certificationSchema } from "@/lib/data/tester-credentials";
import { apiRoute, jsonResponse } from "@/lib/http/route";

export const POST = apiRoute({ permission: "credentials.manage", body: certificationSchema, maxBodyBytes: 8 * 1024 }, async ({ actor, body }) => jsonResponse(await addCertification(actor, body), { status: 201 }));

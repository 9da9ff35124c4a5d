// GET /api/tester/credentials: the signed-in tester's certifications, test kits and what needs attention.
import { listMyCredentials } from "@/lib/data/tester-credentials";
import { apiRoute } from "@/lib/http/route";

export const GET = apiRoute({ permission: "credentials.manage" }, async ({ actor }) => listMyCredentials(actor));

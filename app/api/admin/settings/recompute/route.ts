// GET /api/admin/settings/recompute: how far the recompute of due dates after a settings change has got.
import { getRecomputeStatus } from "@/lib/data/settings";
import { apiRoute } from "@/lib/http/route";

export const GET = apiRoute({ permission: "settings.manage" }, async ({ actor }) => getRecomputeStatus(actor));

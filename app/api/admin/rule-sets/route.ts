// POST /api/admin/rule-sets: adds a local rule-set edition (checked by lib/rules; a less strict value needs a variance reason).
import { createLocalRuleSet, localRuleSetSchema } from "@/lib/data/settings";
import { apiRoute } from "@/lib/http/route";

export const POST = apiRoute({ permission: "settings.manage", body: localRuleSetSchema, maxBodyBytes: 32 * 1024 }, async ({ actor, body }) => createLocalRuleSet(actor, body));

// PUT /api/admin/settings: saves the program's settings; a change that moves due dates recomputes every assembly's facts.
import { settingsSchema, updateProgramSettings } from "@/lib/data/settings";
import { apiRoute } from "@/lib/http/route";

export const PUT = apiRoute({ permission: "settings.manage", body: settingsSchema, maxBodyBytes: 8 * 1024 }, async ({ actor, body }) => updateProgramSettings(actor, body));

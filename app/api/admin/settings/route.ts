// PUT /api/admin/settings: saves the program's settings; a change that moves due dates has every assembly's facts recomputed after the answer.
import { after } from "next/server";
import { recomputeOwedFacts, settingsSchema, updateProgramSettings } from "@/lib/data/settings";
import { apiRoute } from "@/lib/http/route";

export const runtime = "nodejs";

export const PUT = apiRoute({ permission: "settings.manage", body: settingsSchema, maxBodyBytes: 8 * 1024 }, async ({ actor, body }) => {
  const result = await updateProgramSettings(actor, body);
  // The answer goes back at once; the settings page follows the recompute (GET …/recompute).
  // One cut short is finished by the next notice run, or by saving again.
  if (result.isRecomputeOwed) {
    after(() =>
      recomputeOwedFacts(actor).catch((error: unknown) => {
        console.error("[settings] recomputing due dates stopped", error);
      }),
    );
  }
  return result;
});

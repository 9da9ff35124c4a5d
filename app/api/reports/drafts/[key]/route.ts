// GET, PUT, DELETE /api/reports/drafts/:key: one unfinished field test, saved as the tester types (a newer revision always wins).
import { clientKeySchema } from "@/lib/forms/report-submission";
import { deleteDraft, draftSaveSchema, getDraft, saveDraft } from "@/lib/data/drafts";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const GET = apiRoute({ permission: "reports.file" }, async ({ actor, params }) => getDraft(actor, parseOrThrow(clientKeySchema, params.key)));

export const PUT = apiRoute({ permission: "reports.file", body: draftSaveSchema, maxBodyBytes: 64 * 1024 }, async ({ actor, params, body }) => saveDraft(actor, parseOrThrow(clientKeySchema, params.key), body));

export const DELETE = apiRoute({ permission: "reports.file" }, async ({ actor, params }) => deleteDraft(actor, parseOrThrow(clientKeySchema, params.key)));

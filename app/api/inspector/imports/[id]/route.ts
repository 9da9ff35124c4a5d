// GET /api/inspector/imports/:id: an import's progress (the page polls it while it runs).
import { z } from "zod";
import { getImportJob } from "@/lib/data/import-jobs";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const GET = apiRoute({ permission: "inventory.import" }, async ({ actor, params }) => getImportJob(actor, parseOrThrow(z.coerce.number().int().positive("No such import."), params.id)));

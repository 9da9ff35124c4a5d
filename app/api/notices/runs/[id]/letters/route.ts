// GET /api/notices/runs/:id/letters: the run's printed letters (one PDF, a letter per page); POST: mark them printed.
import { z } from "zod";
import { markRunLettersPrinted, readRunLetters } from "@/lib/data/notices-log";
import { apiRoute, parseOrThrow } from "@/lib/http/route";
import { pdfResponse } from "@/lib/pdf/render";

export const runtime = "nodejs";

export const GET = apiRoute({ permission: "notices.view" }, async ({ actor, params }) => {
  const id = parseOrThrow(z.coerce.number().int().positive(), params.id);
  const { bytes, fileName } = await readRunLetters(actor, id);
  return pdfResponse(bytes, fileName, "attachment");
});

export const POST = apiRoute({ permission: "notices.view", body: z.object({ printed: z.literal(true, { error: "Send printed: true once the letters are printed." }) }), maxBodyBytes: 1024 }, async ({ actor, params }) => {
  const id = parseOrThrow(z.coerce.number().int().positive(), params.id);
  return { ok: true, ...(await markRunLettersPrinted(actor, id)) };
});

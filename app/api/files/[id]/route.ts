// GET /api/files/:id: an uploaded file, to its uploader and to the staff of a program it concerns.
import { z } from "zod";
import { readAttachment } from "@/lib/data/attachments";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const runtime = "nodejs";

export const GET = apiRoute({ permission: null }, async ({ actor, params }) => {
  if (!actor) return Response.json({ error: "Please sign in." }, { status: 401 });
  const id = parseOrThrow(z.coerce.number().int().positive(), params.id);
  const file = await readAttachment(actor, id);
  const safeName = file.originalName.replace(/[^A-Za-z0-9._-]+/g, "_");
  return new Response(new Uint8Array(file.bytes), {
    headers: {
      "content-type": file.contentType === "text/csv" ? "text/csv; charset=utf-8" : file.contentType,
      "content-disposition": `${file.contentType === "text/csv" ? "attachment" : "inline"}; filename="${safeName}"`,
      "x-content-type-options": "nosniff",
      "cache-control": "private, no-store",
      // A served upload never runs as a page of ours.
      "content-security-policy": "default-src 'none'; img-src 'self'; style-src 'unsafe-inline'; sandbox",
    },
  });
});

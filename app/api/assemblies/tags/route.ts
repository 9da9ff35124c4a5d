// GET /api/assemblies/tags?ids=1,2,3: a printable sheet of assembly tags (PDF), each with a QR code opening a new test for it.
import { createElement } from "react";
import QRCode from "qrcode";
import { z } from "zod";
import { listAssembliesForTags, MAX_TAGS_PER_SHEET } from "@/lib/data/assemblies-search";
import { getEnv } from "@/lib/env";
import { apiRoute, parseOrThrow } from "@/lib/http/route";
import { pdfResponse, renderPdf } from "@/lib/pdf/render";
import { TagsDocument, type TagLabel } from "@/lib/pdf/tags-document";

export const runtime = "nodejs";

const idsSchema = z
  .string({ message: "Say which assemblies: ids=1,2,3." })
  .regex(/^\d+(,\d+)*$/, { message: "Say which assemblies: ids=1,2,3." })
  .transform((value) => value.split(",").map(Number))
  .refine((ids) => ids.length <= MAX_TAGS_PER_SHEET, { message: `At most ${MAX_TAGS_PER_SHEET} tags at a time.` });

export const GET = apiRoute({ permission: "tags.print" }, async ({ actor, searchParams }) => {
  const ids = parseOrThrow(idsSchema, searchParams.get("ids") ?? undefined);
  const assemblies = await listAssembliesForTags(actor, ids);
  const base = getEnv().APP_URL;
  const labels: TagLabel[] = await Promise.all(
    assemblies.map(async (a) => {
      const url = new URL(`/a/${a.id}`, base).toString();
      // Error correction "M" survives a scuffed label in a meter vault and keeps the code coarse enough to scan.
      const qrDataUrl = await QRCode.toDataURL(url, { errorCorrectionLevel: "M", margin: 1, width: 320 });
      return { ...a, url, qrDataUrl };
    }),
  );
  const bytes = await renderPdf(createElement(TagsDocument, { labels, programName: assemblies[0]?.programName ?? "Zoneward" }));
  return pdfResponse(bytes, `assembly-tags-${ids.length}.pdf`);
});

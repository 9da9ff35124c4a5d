// GET /api/inspector/summary/:year/pdf: the yearly program summary for the state agency, rendered as a PDF on the server.
import { createElement } from "react";
import { z } from "zod";
import { getStaffProgramContext } from "@/lib/data/settings";
import { getYearlySummary, summaryColumns } from "@/lib/data/summary";
import { apiRoute, parseOrThrow } from "@/lib/http/route";
import { pdfResponse, renderPdf } from "@/lib/pdf/render";
import { SummaryDocument } from "@/lib/pdf/summary-document";

export const runtime = "nodejs";

export const GET = apiRoute({ permission: "summary.view" }, async ({ actor, params }) => {
  const year = parseOrThrow(z.coerce.number().int("Choose a year.").min(1990, "Choose a year from 1990 on.").max(9999), params.year);
  const [summary, context] = await Promise.all([getYearlySummary(actor, year), getStaffProgramContext(actor)]);
  const bytes = await renderPdf(
    createElement(SummaryDocument, {
      programName: summary.programName,
      year: summary.year,
      generatedOn: summary.generatedOn,
      preparedBy: actor.name,
      contact: [context.mailingAddress, context.phone, context.contactEmail].filter(Boolean).join(" · "),
      rows: summary.rows,
      byKind: summary.byKind,
      byHazard: summary.byHazard,
      totals: summary.totals,
      columns: summaryColumns,
      notes: summary.notes,
    }),
  );
  return pdfResponse(bytes, `program-summary-${year}.pdf`);
});

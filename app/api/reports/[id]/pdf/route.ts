// GET /api/reports/:id/pdf: the field-test report as a PDF, for the filing tester, the program's staff and the site's owners.
import { createElement } from "react";
import { z } from "zod";
import { getReportProgramContact } from "@/lib/data/tester-report-pdf";
import { getReportDetail } from "@/lib/data/report-detail";
import { errorResponse, apiRoute, parseOrThrow } from "@/lib/http/route";
import { pdfResponse, renderPdf } from "@/lib/pdf/render";
import { ReportDocument } from "@/lib/pdf/report-document";
import { todayInZone } from "@/lib/programs/settings";

export const runtime = "nodejs";

export const GET = apiRoute({ permission: null }, async ({ actor, params, searchParams }) => {
  if (!actor) return errorResponse(401, "Please sign in.", { code: "signed_out" });
  const id = parseOrThrow(z.coerce.number().int().positive(), params.id);
  // getReportDetail decides who may see it; anyone else is told "not found".
  const report = await getReportDetail(actor, id);
  const program = await getReportProgramContact(report.programId);
  const bytes = await renderPdf(createElement(ReportDocument, { report, program, generatedOn: todayInZone(program.timezone) }));
  const name = `${report.reportNumber}${report.revision > 1 ? `-rev${report.revision}` : ""}.pdf`;
  return pdfResponse(bytes, name, searchParams.get("download") ? "attachment" : "inline");
});

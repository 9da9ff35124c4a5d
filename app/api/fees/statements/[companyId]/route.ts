// GET /api/fees/statements/:companyId?month=YYYY-MM: a testing company's monthly filing-fee statement (PDF), for its billing manager or a program admin.
import { createElement } from "react";
import { z } from "zod";
import { can } from "@/lib/auth/permissions";
import { getCompanyStatement } from "@/lib/data/fees-statement";
import { apiRoute, errorResponse, parseOrThrow } from "@/lib/http/route";
import { pdfResponse, renderPdf } from "@/lib/pdf/render";
import { StatementDocument } from "@/lib/pdf/statement-document";

export const runtime = "nodejs";

export const GET = apiRoute({ permission: null }, async ({ actor, params, searchParams }) => {
  if (!actor) return errorResponse(401, "Please sign in.", { code: "signed_out" });
  if (!can(actor, "fees.pay_company") && !can(actor, "fees.manage")) return errorResponse(403, "You are not allowed to do this.", { code: "forbidden" });
  const companyId = parseOrThrow(z.coerce.number().int().positive(), params.companyId);
  const month = parseOrThrow(z.string().regex(/^\d{4}-(0[1-9]|1[0-2])$/, "Choose a month as YYYY-MM."), searchParams.get("month") ?? "");
  const statement = await getCompanyStatement(actor, companyId, month);
  const bytes = await renderPdf(createElement(StatementDocument, { statement }));
  return pdfResponse(bytes, `fee-statement-${statement.company.name}-${month}.pdf`, searchParams.get("download") ? "attachment" : "inline");
});

// GET /api/inspector/summary/:year/csv: the yearly program summary for the state agency, as CSV (formula-safe).
import { z } from "zod";
import { csvResponse } from "@/lib/data/import-csv";
import { getYearlySummary, summaryToCsv } from "@/lib/data/summary";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const runtime = "nodejs";

export const GET = apiRoute({ permission: "summary.view" }, async ({ actor, params }) => {
  const year = parseOrThrow(z.coerce.number().int("Choose a year.").min(1990, "Choose a year from 1990 on.").max(9999), params.year);
  const summary = await getYearlySummary(actor, year);
  return csvResponse(summaryToCsv(summary), `program-summary-${year}.csv`);
});

// GET /api/inspector/compliance/list: an attention list (overdue, repair overdue, due soon…) one keyset page at a time; ?format=csv for the whole list (formula-safe).
import { csvLine, csvResponse } from "@/lib/data/import-csv";
import { listOverdueAssemblies, overdueListSchema } from "@/lib/data/compliance";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const GET = apiRoute({ permission: "compliance.view" }, async ({ actor, searchParams }) => {
  const query = parseOrThrow(overdueListSchema, Object.fromEntries([...searchParams].filter(([k]) => k !== "format")));
  if (searchParams.get("format") !== "csv") return listOverdueAssemblies(actor, query);
  const lines = [csvLine(["Account", "Site", "Address", "Assembly id", "Kind", "Serial", "Location", "Hazard", query.list === "repair_overdue" || query.list === "failed_awaiting_repair" ? "Repair due" : "Test due", "Days late", "Last test", "Notice this cycle"])];
  let after = query.after;
  // Up to 100 pages of 50: the longest list a program should ever have to print.
  for (let page = 0; page < 100; page++) {
    const result = await listOverdueAssemblies(actor, { ...query, after });
    for (const r of result.rows) lines.push(csvLine([r.accountNumber, r.siteName, r.address, r.assemblyId, r.kind, r.serial, r.location, r.hazard, r.dueOn ?? "", r.daysLate ?? "", r.lastTestedOn ?? "", r.noticeStage ?? ""]));
    if (!result.next) break;
    after = result.next;
  }
  return csvResponse(`\uFEFF${lines.join("\r\n")}\r\n`, `${query.list}-${new Date().toISOString().slice(0, 10)}.csv`);
});

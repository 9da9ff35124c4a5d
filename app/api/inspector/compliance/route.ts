// GET /api/inspector/compliance: today's counts by compliance state (for the program or a filter), overdue by notice stage, and the program's tests per month.
import { complianceFilterSchema, countOverdueByNoticeStage, getComplianceCounts, getMonthlyTests } from "@/lib/data/compliance";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const GET = apiRoute({ permission: "compliance.view" }, async ({ actor, searchParams }) => {
  const filter = parseOrThrow(complianceFilterSchema, Object.fromEntries(searchParams));
  const [counts, months, stages] = await Promise.all([getComplianceCounts(actor, filter), getMonthlyTests(actor), countOverdueByNoticeStage(actor, filter)]);
  return { ...counts, months, overdueByNoticeStage: stages };
});

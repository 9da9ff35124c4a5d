// GET /api/reports/mine?page=&pageSize=&sort=&dir=&status=&from=&to=&q=: the signed-in tester's reports, paginated, sorted and filtered on the server.
import { listMyReports, myReportsQuerySchema } from "@/lib/data/tester-reports";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const GET = apiRoute({ permission: "reports.read_own" }, async ({ actor, searchParams }) => {
  const raw = Object.fromEntries([...searchParams.entries()].filter(([, value]) => value !== ""));
  return listMyReports(actor, parseOrThrow(myReportsQuerySchema, raw));
});

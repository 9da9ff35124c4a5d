// POST /api/reports: files a field-test report (idempotent per tester and key; graded again on the server).
import { submitReport } from "@/lib/data/reports";
import { reportSubmissionSchema } from "@/lib/forms/report-submission";
import { apiRoute, jsonResponse } from "@/lib/http/route";

export const POST = apiRoute({ permission: "reports.file", body: reportSubmissionSchema, maxBodyBytes: 64 * 1024 }, async ({ actor, body }) => {
  const report = await submitReport(actor, body);
  return jsonResponse(report, { status: report.isReplay ? 200 : 201 });
});

// GET /api/admin/audit/csv: the filtered audit log as CSV (formula-safe), streamed in pages.
import { auditQuerySchema, exportAuditLogCsv } from "@/lib/data/audit-log";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const runtime = "nodejs";

export const GET = apiRoute({ permission: "audit.view" }, async ({ actor, searchParams }) => {
  const query = { ...parseOrThrow(auditQuerySchema, Object.fromEntries(searchParams)), before: undefined };
  const chunks = exportAuditLogCsv(actor, query);
  // The first chunk is read before answering, so a refused filter is an error answer, not a broken file.
  const first = await chunks.next();
  const encoder = new TextEncoder();
  const stream = new ReadableStream<Uint8Array>({
    start(controller) {
      if (!first.done) controller.enqueue(encoder.encode(first.value));
    },
    async pull(controller) {
      const next = await chunks.next();
      if (next.done) controller.close();
      else controller.enqueue(encoder.encode(next.value));
    },
  });
  return new Response(stream, { headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": 'attachment; filename="audit-log.csv"', "cache-control": "private, no-store", "x-content-type-options": "nosniff" } });
});

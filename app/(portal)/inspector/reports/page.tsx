import type { Metadata } from "next";
import { Suspense } from "react";
import { ReviewQueue, type QueueFilterState } from "@/components/inspector/review-queue";
import { PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { listQueueTesters, listReviewQueue, queuePageSchema } from "@/lib/data/review-queue";
import { getStaffProgramContext } from "@/lib/data/settings";

export const metadata: Metadata = { title: "Review queue" };

export default async function ReviewQueuePage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const actor = await requirePermission("reports.review");
  const raw = Object.fromEntries(Object.entries(await searchParams).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v]));
  const query = queuePageSchema.parse({ ...raw, cursor: undefined, limit: 25 });
  const [page, testers, context] = await Promise.all([listReviewQueue(actor, query), listQueueTesters(actor), getStaffProgramContext(actor)]);
  const filter: QueueFilterState = {
    kind: query.kind,
    grade: query.grade,
    testerId: query.testerId ? String(query.testerId) : undefined,
    age: query.age ? String(query.age) : undefined,
    flags: query.flags,
    sort: query.sort === "oldest" ? undefined : query.sort,
  };
  return (
    <>
      <PageHeader
        title="Review queue"
        description="Filed reports waiting for a decision, oldest first. Each row shows the server's grade, whether the tester's certification and kit were valid on the test date, and anything the checks found. Open a report to accept or return it."
      />
      <Suspense>
        <ReviewQueue initialFilter={filter} initialPage={page} testers={testers} timezone={context.timezone} />
      </Suspense>
    </>
  );
}

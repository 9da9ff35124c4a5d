import "server-only";
import type { Actor } from "@/lib/auth/permissions";
import { assertCan } from "@/lib/auth/permissions";
import { listDrafts, type DraftSummary } from "./drafts";
import { listComingDue, type ComingDueAssembly } from "./tester-coming-due";
import { listMyCredentials, type MyCredentials } from "./tester-credentials";
import { listMyProgramApprovals } from "./testers";
import { countMyReportsByStatus, listReturnedReports, type ReturnedReport } from "./tester-reports";

export interface TesterHome {
  approvals: Awaited<ReturnType<typeof listMyProgramApprovals>>;
  credentials: MyCredentials;
  returned: ReturnedReport[];
  drafts: DraftSummary[];
  comingDue: { today: string; until: string; rows: ComingDueAssembly[] };
  counts: Record<string, number>;
}

/** Everything the tester's home page shows, in one round of queries. */
export async function getTesterHome(actor: Actor): Promise<TesterHome> {
  assertCan(actor, "tester.home");
  const [approvals, credentials, returned, drafts, comingDue, counts] = await Promise.all([
    listMyProgramApprovals(actor),
    listMyCredentials(actor),
    listReturnedReports(actor),
    listDrafts(actor),
    listComingDue(actor),
    countMyReportsByStatus(actor),
  ]);
  return { approvals, credentials, returned, drafts: drafts.slice(0, 10), comingDue, counts };
}

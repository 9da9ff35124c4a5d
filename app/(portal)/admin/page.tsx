import type { Metadata } from "next";
import { formatInstant } from "@/components/inspector/format";
import { Card, PageHeader, StatTile } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { listAuditLog } from "@/lib/data/audit-log";
import { getQueueStats } from "@/lib/data/review-queue";
import { getStaffProgramContext, listRuleSetEditions } from "@/lib/data/settings";
import { listProgramStaff } from "@/lib/data/users-admin";

export const metadata: Metadata = { title: "Program admin" };

export default async function AdminHome() {
  const actor = await requirePermission("settings.manage");
  const context = await getStaffProgramContext(actor);
  const [staff, audit, today, queue] = await Promise.all([listProgramStaff(actor), listAuditLog(actor, {}), listAuditLog(actor, { from: context.today }), getQueueStats(actor)]);
  const editions = await listRuleSetEditions(context.id);
  const s = context.settings;
  const edition = editions.find((e) => e.edition === s.ruleSetEdition);
  return (
    <>
      <PageHeader title={context.name} description="Program settings, users, the audit log — and the inspector's view of the program." />
      <div className="mb-6 grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
        <StatTile label="Reports waiting for review" value={queue.waiting.toLocaleString("en-US")} href="/inspector/reports" tone={queue.waiting ? "caution" : "neutral"} />
        <StatTile label="Active inspectors and admins" value={staff.filter((m) => m.status === "active").length} href="/admin/users" />
        <StatTile label="Invitations not yet accepted" value={staff.filter((m) => m.status === "invited").length} href="/admin/users" tone={staff.some((m) => m.status === "invited") ? "caution" : "neutral"} />
        <StatTile label="Changes recorded today" value={today.next ? `${today.rows.length}+` : today.rows.length} href="/admin/audit" />
      </div>
      <div className="grid gap-6 lg:grid-cols-2">
        <Card title="The rules in force" actions={<a href="/admin/settings">Change the settings</a>}>
          <dl className="grid grid-cols-2 gap-3 text-sm">
            <div>
              <dt className="text-ink-600">Test interval</dt>
              <dd className="font-semibold">
                {s.testIntervalMonths} months, {s.dueModel === "window" ? `due in the window ${s.windowStart} to ${s.windowEnd}` : "from the last passing test"}
              </dd>
            </div>
            <div>
              <dt className="text-ink-600">Repair deadline</dt>
              <dd className="font-semibold">
                {s.repairDaysSevere} / {s.repairDaysHigh} / {s.repairDaysLow} days (severe / high / low)
              </dd>
            </div>
            <div>
              <dt className="text-ink-600">Notices</dt>
              <dd className="font-semibold">
                {s.reminderDaysBefore} days before, {s.overdueDaysAfter} and {s.finalDaysAfter} days after
              </dd>
            </div>
            <div>
              <dt className="text-ink-600">Filing fee</dt>
              <dd className="font-semibold">{s.filingFeeCents ? `${(s.filingFeeCents / 100).toFixed(2)} ${s.currency}` : "none"}</dd>
            </div>
            <div>
              <dt className="text-ink-600">Units</dt>
              <dd className="font-semibold">{s.units}</dd>
            </div>
            <div>
              <dt className="text-ink-600">Rule-set edition</dt>
              <dd className="font-semibold">{edition?.label ?? s.ruleSetEdition}</dd>
            </div>
          </dl>
          <p className="mt-4 text-sm">
            <a href="/admin/return-reasons">Return reasons</a>
          </p>
        </Card>
        <Card title="Latest changes" actions={<a href="/admin/audit">The whole audit log</a>}>
          <ul className="space-y-1.5 text-sm">
            {audit.rows.slice(0, 10).map((r) => (
              <li key={r.id}>
                <span className="text-ink-600">{formatInstant(r.at, context.timezone)}</span> · {r.actorName ?? "system"} · <span className="font-mono text-xs">{r.action}</span> {r.entityType} #{r.entityId}
              </li>
            ))}
          </ul>
        </Card>
        <Card title="The program">
          <ul className="list-inside list-disc space-y-1">
            <li>
              <a href="/inspector">Inspector&apos;s view of the program</a>
            </li>
            <li>
              <a href="/inspector/testers">Tester roster</a>
            </li>
            <li>
              <a href="/inspector/summary">Yearly summary for the state</a>
            </li>
          </ul>
        </Card>
        <Card title="Administration">
          <ul className="list-inside list-disc space-y-1">
            <li>
              <a href="/admin/users">Users: inspectors, admins and owners&apos; portal access</a>
            </li>
            <li>
              <a href="/admin/mailbox">Mailbox (messages sent in this installation)</a>
            </li>
          </ul>
        </Card>
      </div>
    </>
  );
}

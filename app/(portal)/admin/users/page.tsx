import type { Metadata } from "next";
import { InviteStaffForm, OwnerInviteButton, StaffTable } from "@/components/admin/users-manager";
import { formatInstant } from "@/components/inspector/format";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { getStaffProgramContext } from "@/lib/data/settings";
import { listOwnerAccess, listProgramStaff, ownerAccessQuerySchema } from "@/lib/data/users-admin";

export const metadata: Metadata = { title: "Users" };

export default async function UsersPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const actor = await requirePermission("users.manage");
  const query = ownerAccessQuerySchema.parse(await searchParams);
  const [staff, owners, context] = await Promise.all([listProgramStaff(actor), listOwnerAccess(actor, query), getStaffProgramContext(actor)]);
  const next = owners.nextAfter ? `/admin/users?${new URLSearchParams({ ...(query.q ? { q: query.q } : {}), ...(query.portal !== "all" ? { portal: query.portal } : {}), after: String(owners.nextAfter) }).toString()}#owners` : null;
  return (
    <>
      <PageHeader title="Users" description={`Who works in ${context.name}'s program, and which owners use the owner portal. Testers register themselves and are approved on the tester roster.`} actions={<a href="/inspector/testers">Tester roster</a>} />
      <div className="space-y-6">
        <Card title={`Inspectors and admins (${staff.length})`}>
          <StaffTable
            staff={staff.map((s) => ({
              id: s.id,
              name: s.name,
              email: s.email,
              role: s.role,
              status: s.status,
              isSelf: s.isSelf,
              lastSignIn: s.lastSignInAt ? formatInstant(s.lastSignInAt, context.timezone) : "",
              invitationExpires: s.invitationExpiresAt ? formatInstant(s.invitationExpiresAt, context.timezone) : "",
            }))}
          />
        </Card>
        <Card title="Invite an inspector or admin">
          <InviteStaffForm />
        </Card>
        <div id="owners">
          <Card title="Owners and the owner portal">
            <form className="mb-4 flex flex-wrap items-end gap-3" action="/admin/users#owners">
              <div className="min-w-56 flex-1">
                <label htmlFor="owner-q" className="block text-xs font-semibold uppercase tracking-wide text-ink-600">
                  Owner
                </label>
                <input id="owner-q" name="q" type="search" defaultValue={query.q} placeholder="Name or e-mail" className="block w-full rounded-md border border-ink-200 px-3 py-2" />
              </div>
              <div>
                <label htmlFor="owner-portal" className="block text-xs font-semibold uppercase tracking-wide text-ink-600">
                  Portal
                </label>
                <select id="owner-portal" name="portal" defaultValue={query.portal} className="rounded-md border border-ink-200 px-2.5 py-2">
                  <option value="all">Everyone with an e-mail address</option>
                  <option value="none">Not invited</option>
                  <option value="invited">Invited, not set up</option>
                  <option value="active">Uses the portal</option>
                </select>
              </div>
              <button className="rounded-md bg-estuary-700 px-4 py-2 font-semibold text-white">Show</button>
            </form>
            <table className="w-full text-left text-sm">
              <thead className="border-b border-ink-200 text-xs uppercase tracking-wide text-ink-600">
                <tr>
                  <th className="py-2 pr-3">Owner</th>
                  <th className="py-2 pr-3">Sites</th>
                  <th className="py-2 pr-3">Last signed in</th>
                  <th className="py-2">Owner portal</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-ink-100">
                {owners.rows.map((o) => (
                  <tr key={o.ownerId}>
                    <td className="py-2 pr-3">
                      <a href={`/inspector/owners/${o.ownerId}`} className="font-semibold">
                        {o.name}
                      </a>
                      <div className="text-xs text-ink-600">{o.email}</div>
                    </td>
                    <td className="py-2 pr-3 tabular-nums">{o.siteCount}</td>
                    <td className="py-2 pr-3">{o.lastSignInAt ? formatInstant(o.lastSignInAt, context.timezone) : "—"}</td>
                    <td className="py-2">
                      <OwnerInviteButton ownerId={o.ownerId} portal={o.portal} />
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
            {owners.rows.length === 0 ? <p className="py-4 text-center text-ink-600">Nobody matches.</p> : null}
            {next ? (
              <p className="mt-3 text-center">
                <a href={next}>More owners →</a>
              </p>
            ) : null}
          </Card>
        </div>
      </div>
    </>
  );
}

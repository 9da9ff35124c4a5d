import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { formatInstant } from "@/components/inspector/format";
import { InviteOwnerButton, OwnerForm } from "@/components/inspector/inventory-forms";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { can } from "@/lib/auth/permissions";
import { getOwnerForStaff } from "@/lib/data/inventory-owners";
import { getStaffProgramContext } from "@/lib/data/settings";
import { NotFoundError } from "@/lib/errors";

export const metadata: Metadata = { title: "Owner" };

export default async function OwnerPage({ params }: { params: Promise<{ id: string }> }) {
  const actor = await requirePermission("inventory.view");
  const id = Number((await params).id);
  if (!Number.isInteger(id) || id <= 0) notFound();
  const owner = await getOwnerForStaff(actor, id).catch((error: unknown) => {
    if (error instanceof NotFoundError) notFound();
    throw error;
  });
  const context = await getStaffProgramContext(actor);
  const canManage = can(actor, "inventory.manage");
  return (
    <>
      <p className="mb-2 text-sm">
        <a href="/inspector/inventory?view=owners">← Owners</a>
      </p>
      <PageHeader title={owner.name} description={[owner.email ?? "No e-mail address: notices go by letter", owner.phone, owner.mailingAddress].filter(Boolean).join(" · ")} />
      <div className="grid gap-6 lg:grid-cols-2">
        <Card title={`Sites (${owner.sites.length})`}>
          <ul className="divide-y divide-ink-100">
            {owner.sites.map((s) => (
              <li key={s.id} className="py-2">
                <a href={`/inspector/sites/${s.id}`} className="font-semibold">
                  {s.name}
                </a>
                <p className="text-sm text-ink-600">
                  {s.address} · account {s.accountNumber} · {s.relation} · {s.receivesNotices ? "receives notices" : "no notices"}
                </p>
              </li>
            ))}
          </ul>
        </Card>
        <div className="space-y-6">
          <Card title="Owner portal">
            <p className="mb-3 text-sm text-ink-700">
              {owner.portal.status === "none" ? "Not invited yet." : owner.portal.status === "invited" ? `Invited (${owner.portal.email}); the account is not set up yet.` : owner.portal.status === "active" ? `Signed up as ${owner.portal.email}${owner.portal.lastSignInAt ? `; last signed in ${formatInstant(owner.portal.lastSignInAt, context.timezone)}` : ""}.` : "The portal account is disabled."}
            </p>
            {canManage && owner.email ? <InviteOwnerButton ownerId={owner.id} portal={owner.portal.status} /> : null}
          </Card>
          {canManage ? (
            <Card title="Edit the contact">
              <OwnerForm ownerId={owner.id} values={owner} />
            </Card>
          ) : null}
        </div>
      </div>
    </>
  );
}

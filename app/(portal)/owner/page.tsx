import type { Metadata } from "next";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { listOwnerSites } from "@/lib/data/owner-portal";

export const metadata: Metadata = { title: "My sites" };

export default async function OwnerHome() {
  const actor = await requirePermission("owner.portal");
  const sites = await listOwnerSites(actor);
  return (
    <>
      <PageHeader title="My sites" description="Each backflow assembly at your properties, and where it stands with the water program." />
      <div className="space-y-4">
        {sites.map((s) => (
          <Card key={s.siteId} title={`${s.addressLine1}, ${s.city}`}>
            <p className="text-ink-600">
              {s.siteName} · account {s.accountNumber} · {s.programName} · {s.assemblyCount} assemblies
            </p>
          </Card>
        ))}
        {sites.length === 0 ? <p className="text-ink-600">No sites are linked to your account yet. Contact the program office.</p> : null}
      </div>
    </>
  );
}

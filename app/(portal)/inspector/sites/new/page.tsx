import type { Metadata } from "next";
import { SiteForm } from "@/components/inspector/inventory-forms";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { listFacilityTypes } from "@/lib/data/inventory-search";

export const metadata: Metadata = { title: "Add a site" };

export default async function NewSitePage() {
  const actor = await requirePermission("inventory.manage");
  const facilityTypes = await listFacilityTypes(actor);
  return (
    <>
      <p className="mb-2 text-sm">
        <a href="/inspector/inventory">← Inventory</a>
      </p>
      <PageHeader title="Add a site" description="A service connection of the program. Add its assemblies and owners on the site's page afterwards." />
      <Card>
        <SiteForm facilityTypes={facilityTypes} />
      </Card>
    </>
  );
}

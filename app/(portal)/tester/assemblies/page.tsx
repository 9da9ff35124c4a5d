import type { Metadata } from "next";
import { AssemblyFinder } from "@/components/tester/assembly-finder";
import { Alert } from "@/components/ui/alert";
import { PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { listApprovedPrograms } from "@/lib/data/tester-programs";

export const metadata: Metadata = { title: "Find an assembly" };

export default async function FindAssemblyPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const actor = await requirePermission("reports.file");
  const params = await searchParams;
  const programs = (await listApprovedPrograms(actor)).map((p) => ({ id: p.id, name: p.name, shortName: p.shortName, units: p.units }));
  return (
    <div className="mx-auto max-w-3xl">
      <PageHeader title="Find an assembly" description="Search the inventory of the programs that approved you, then start the test." />
      {programs.length === 0 ? (
        <Alert tone="warning" title="No program has approved you yet">
          Once a program checks your certificate and approves you, its assemblies can be found here.
        </Alert>
      ) : (
        <AssemblyFinder programs={programs} isPickingTags={Boolean(params.tags)} preferredProgram={params.program ? Number(params.program) : undefined} />
      )}
    </div>
  );
}

import type { Metadata } from "next";
import { RegisterAssemblyForm } from "@/components/tester/register-assembly-form";
import { Alert } from "@/components/ui/alert";
import { PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { listApprovedPrograms } from "@/lib/data/tester-programs";

export const metadata: Metadata = { title: "Register an assembly" };

export default async function RegisterAssemblyPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const actor = await requirePermission("assemblies.register");
  const params = await searchParams;
  const approved = await listApprovedPrograms(actor);
  const programs = approved.map((p) => ({ id: p.id, name: p.name, shortName: p.shortName, units: p.units }));
  return (
    <div className="mx-auto max-w-3xl">
      <PageHeader title="Register a new assembly" description="For an assembly installed where the inventory has none yet. Copy make, model, size and serial from the data plate." />
      {programs.length === 0 ? (
        <Alert tone="warning">No program has approved you yet.</Alert>
      ) : (
        <RegisterAssemblyForm programs={programs} preferredProgram={params.program ? Number(params.program) : undefined} today={approved[0]!.today} />
      )}
    </div>
  );
}

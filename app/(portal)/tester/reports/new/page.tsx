import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { FieldTestForm } from "@/components/field-test/field-test-form";
import { Alert } from "@/components/ui/alert";
import { ButtonLink } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { listDraftsForAssembly } from "@/lib/data/drafts";
import { getFieldTestContext, type FieldTestContext } from "@/lib/data/tester-field-test";
import { AppError, NotFoundError } from "@/lib/errors";

export const metadata: Metadata = { title: "Field test" };

const idOf = (value: string | string[] | undefined): number | undefined => {
  const text = Array.isArray(value) ? value[0] : value;
  return text && /^\d{1,10}$/.test(text) && Number(text) > 0 ? Number(text) : undefined;
};

export default async function NewReportPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const actor = await requirePermission("reports.file");
  const params = await searchParams;
  const target = { assemblyId: idOf(params.assembly), correctsReportId: idOf(params.corrects), amendsReportId: idOf(params.amends) };
  if (!target.assemblyId && !target.correctsReportId && !target.amendsReportId) {
    return (
      <>
        <PageHeader title="New field test" description="Find the assembly first: by its serial number, the street address or the account number." />
        <ButtonLink href="/tester/assemblies" size="lg">
          Find the assembly
        </ButtonLink>
      </>
    );
  }
  let context: FieldTestContext;
  try {
    context = await getFieldTestContext(actor, target);
  } catch (error) {
    if (error instanceof NotFoundError) notFound();
    if (error instanceof AppError) {
      return (
        <>
          <PageHeader title="This test cannot be opened" />
          <Alert tone="warning">{error.message}</Alert>
          <div className="mt-4 flex flex-wrap gap-2">
            <ButtonLink href="/tester/reports" variant="secondary">
              My reports
            </ButtonLink>
            <ButtonLink href="/tester/assemblies" variant="secondary">
              Find an assembly
            </ButtonLink>
          </div>
        </>
      );
    }
    throw error;
  }
  const drafts = await listDraftsForAssembly(actor, context.assembly.id);
  const heading = context.basis?.kind === "correction" ? "Correct a returned report" : context.basis?.kind === "amendment" ? "Amend an accepted report" : "Field test";
  return (
    <div className="mx-auto max-w-3xl">
      <PageHeader title={heading} description={`${context.assembly.kind} at ${context.assembly.site.addressLine1}, ${context.assembly.site.city} · ${context.program.name} · readings in ${context.assembly.kind === "AG" ? "inches" : context.program.units}`} />
      <FieldTestForm context={context} serverDrafts={drafts} />
    </div>
  );
}

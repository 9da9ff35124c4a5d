import type { Metadata } from "next";
import { MyReportsTable, type ReportFilters } from "@/components/tester/my-reports-table";
import { ButtonLink } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { reportSortKeys } from "@/lib/data/tester-reports";

export const metadata: Metadata = { title: "My reports" };

const isDate = (value: string | undefined) => (value && /^\d{4}-\d{2}-\d{2}$/.test(value) ? value : "");

export default async function MyReportsPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  await requirePermission("reports.read_own");
  const params = await searchParams;
  const page = Number(params.page);
  const pageSize = Number(params.pageSize);
  const filters: ReportFilters = {
    status: /^[a-z_,]{0,80}$/.test(params.status ?? "") ? (params.status ?? "") : "",
    from: isDate(params.from),
    to: isDate(params.to),
    q: (params.q ?? "").slice(0, 40),
    sort: (reportSortKeys as readonly string[]).includes(params.sort ?? "") ? params.sort! : "testedOn",
    dir: params.dir === "asc" ? "asc" : "desc",
    page: Number.isInteger(page) && page > 0 ? page : 1,
    pageSize: [10, 20, 50, 100].includes(pageSize) ? pageSize : 20,
  };
  return (
    <>
      <PageHeader
        title="My reports"
        description="Every report you filed: waiting for review, accepted, or returned with the inspector's reasons."
        actions={
          <ButtonLink href="/tester/assemblies" size="lg">
            Start a test
          </ButtonLink>
        }
      />
      <MyReportsTable initialFilters={filters} />
    </>
  );
}

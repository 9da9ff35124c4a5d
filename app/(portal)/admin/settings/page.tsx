import type { Metadata } from "next";
import { RecomputeStatusPanel } from "@/components/admin/recompute-status";
import { RuleSetForm, type ValueRow } from "@/components/admin/rule-set-form";
import { SettingsForm } from "@/components/admin/settings-form";
import { formatDay, formatInstant } from "@/components/inspector/format";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { getSettingsView, getStaffProgramContext } from "@/lib/data/settings";
import { publishedRuleSets, ruleSetValuePaths, valueAtPath } from "@/lib/rules";

export const metadata: Metadata = { title: "Program settings" };

const valueRows: Record<string, Omit<ValueRow, "path">> = {
  "rp.reliefMin": { label: "RP relief valve opening point, minimum", unit: "psid", kind: "number" },
  "rp.check1Min": { label: "RP check #1 differential, minimum", unit: "psid", kind: "number" },
  "rp.check1MustExceedRelief": { label: "RP check #1 must exceed the relief opening point", unit: "", kind: "boolean" },
  "rp.bufferMin": { label: "RP buffer (check #1 minus relief), minimum", unit: "psid", kind: "nullable" },
  "rp.check2FlowMin": { label: "RP check #2 in the direction of flow, minimum", unit: "psid", kind: "nullable" },
  "dc.check1Min": { label: "DC check #1 differential, minimum", unit: "psid", kind: "number" },
  "dc.check2Min": { label: "DC check #2 differential, minimum", unit: "psid", kind: "number" },
  "pvb.airInletMin": { label: "PVB air inlet opening point, minimum", unit: "psid", kind: "number" },
  "pvb.checkMin": { label: "PVB check differential, minimum", unit: "psid", kind: "number" },
  "svb.airInletMin": { label: "SVB air inlet opening point, minimum", unit: "psid", kind: "number" },
  "svb.checkMin": { label: "SVB check differential, minimum", unit: "psid", kind: "number" },
  "airGap.diameterFactor": { label: "Air gap, times the supply pipe diameter", unit: "×", kind: "number" },
  "airGap.minInches": { label: "Air gap, never less than", unit: "in.", kind: "number" },
  "airGap.sideWallFactor": { label: "Air gap near a side wall, times the diameter", unit: "×", kind: "number" },
  "airGap.sideWallMinInches": { label: "Air gap near a side wall, never less than", unit: "in.", kind: "number" },
  "gauge.rangeMaxPsid": { label: "Test kit range", unit: "psid", kind: "number" },
  "kit.verificationMaxMonths": { label: "Kit accuracy verified within", unit: "months", kind: "number" },
};

export default async function SettingsPage() {
  const actor = await requirePermission("settings.manage");
  const [view, context] = await Promise.all([getSettingsView(actor), getStaffProgramContext(actor)]);
  const published = publishedRuleSets.map((r) => ({ edition: r.edition, label: r.label, values: Object.fromEntries(ruleSetValuePaths.map((p) => [p, valueAtPath(r, p) as number | boolean | null])) }));
  const rows: ValueRow[] = ruleSetValuePaths.map((path) => ({ path, ...(valueRows[path] ?? { label: path, unit: "", kind: "number" as const }) }));
  const locals = view.editions.filter((e) => !e.isPublished);
  return (
    <>
      <PageHeader title="Program settings" description={`How ${view.programName} runs its program. Last changed ${formatInstant(view.updatedAt, context.timezone)}. Every change is kept in the audit log.`} />
      {view.recompute.pendingSince ? (
        <div className="mb-6">
          <RecomputeStatusPanel initial={view.recompute} timezone={context.timezone} />
        </div>
      ) : null}
      <SettingsForm initial={view.settings} editions={view.editions} />
      <div className="mt-8 space-y-6">
        <Card title="The program's own rule-set editions">
          {locals.length === 0 ? (
            <p className="mb-4 text-sm text-ink-600">None yet. A local edition holds stricter minimums (or a documented variance) without any change to the software.</p>
          ) : (
            <ul className="mb-6 space-y-2 text-sm">
              {locals.map((e) => (
                <li key={e.edition}>
                  <span className="font-semibold">{e.label}</span> ({e.edition}), based on {e.basedOn}, adopted {formatDay(e.adoptedOn)}
                  {e.edition === view.settings.ruleSetEdition ? " — in force" : ""}
                  {e.variances.length ? (
                    <ul className="ml-5 list-disc text-ink-700">
                      {e.variances.map((v) => (
                        <li key={v.path}>
                          Variance on {v.path}: {v.reason}
                        </li>
                      ))}
                    </ul>
                  ) : null}
                </li>
              ))}
            </ul>
          )}
          <details>
            <summary className="cursor-pointer font-semibold text-estuary-700">Add a local edition</summary>
            <div className="mt-4">
              <RuleSetForm published={published} rows={rows} today={context.today} />
            </div>
          </details>
        </Card>
        <p className="text-sm">
          <a href="/admin/return-reasons">The return reasons inspectors pick from →</a>
        </p>
      </div>
    </>
  );
}

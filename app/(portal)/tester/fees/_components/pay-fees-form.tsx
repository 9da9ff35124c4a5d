"use client";

import { useMemo, useState } from "react";
import { Alert } from "@/components/ui/alert";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import type { OutstandingFee } from "@/lib/data/fees";
import { formatMoney } from "@/lib/payments/money";

interface ProgramGroup {
  programId: number;
  programName: string;
  currency: string;
  fees: OutstandingFee[];
}

/** One checkout per program (one currency): the tester ticks reports and pays them together. */
export function PayFeesForm({ fees, showTester }: { fees: OutstandingFee[]; showTester: boolean }) {
  const groups = useMemo(() => {
    const byProgram = new Map<string, ProgramGroup>();
    for (const fee of fees) {
      const key = `${fee.programId}:${fee.currency}`;
      const group = byProgram.get(key) ?? { programId: fee.programId, programName: fee.programName, currency: fee.currency, fees: [] };
      group.fees.push(fee);
      byProgram.set(key, group);
    }
    return [...byProgram.values()];
  }, [fees]);
  return (
    <div className="space-y-6">
      {groups.map((g) => (
        <ProgramFees key={`${g.programId}-${g.currency}`} group={g} showTester={showTester} />
      ))}
    </div>
  );
}

function ProgramFees({ group, showTester }: { group: ProgramGroup; showTester: boolean }) {
  const [selected, setSelected] = useState<Set<number>>(() => new Set(group.fees.map((f) => f.reportId)));
  const [error, setError] = useState<string | null>(null);
  const [isBusy, setIsBusy] = useState(false);
  const chosen = group.fees.filter((f) => selected.has(f.reportId));
  // Shown for the tester's information only: the server computes the amount from the reports.
  const total = chosen.reduce((sum, f) => sum + f.feeCents, 0);
  const allChosen = chosen.length === group.fees.length;
  const toggle = (id: number) =>
    setSelected((current) => {
      const next = new Set(current);
      if (next.has(id)) next.delete(id);
      else next.add(id);
      return next;
    });

  async function pay() {
    setError(null);
    setIsBusy(true);
    try {
      const response = await fetch("/api/fees/checkout", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ reportIds: chosen.map((f) => f.reportId) }) });
      const body = (await response.json().catch(() => ({}))) as { url?: string; error?: string };
      if (!response.ok || !body.url) {
        setError(body.error ?? "The checkout could not be opened. Please try again.");
        setIsBusy(false);
        return;
      }
      window.location.assign(body.url);
    } catch {
      setError("No connection to Zoneward. Nothing was charged; please try again when you are back online.");
      setIsBusy(false);
    }
  }

  return (
    <Card
      title={group.programName}
      actions={
        <label className="flex items-center gap-2 text-sm">
          <input type="checkbox" className="h-5 w-5" checked={allChosen} onChange={() => setSelected(allChosen ? new Set() : new Set(group.fees.map((f) => f.reportId)))} />
          Select all
        </label>
      }
    >
      <ul className="divide-y divide-ink-100">
        {group.fees.map((f) => {
          const id = `fee-${f.reportId}`;
          return (
            <li key={f.reportId} className="flex items-start gap-3 py-3">
              <input id={id} type="checkbox" className="mt-1 h-6 w-6 shrink-0" aria-label={`Pay the fee of report ${f.report}`} checked={selected.has(f.reportId)} onChange={() => toggle(f.reportId)} />
              <div className="min-w-0 flex-1">
                <div className="flex flex-wrap items-center gap-x-2 gap-y-1">
                  {f.isOwn ? (
                    <a href={`/tester/reports/${f.reportId}`} className="font-semibold">
                      {f.report}
                    </a>
                  ) : (
                    <span className="font-semibold">{f.report}</span>
                  )}
                  {f.isInOpenCheckout ? <Badge tone="caution">in an open checkout</Badge> : null}
                </div>
                <p className="text-sm text-ink-700">{f.assembly}</p>
                <p className="text-sm text-ink-600">
                  Filed {f.submittedOn}
                  {showTester ? ` by ${f.isOwn ? "you" : f.testerName}` : ""}
                </p>
              </div>
              <label htmlFor={id} className="shrink-0 pt-0.5 font-semibold tabular-nums">
                {formatMoney(f.feeCents, f.currency)}
              </label>
            </li>
          );
        })}
      </ul>
      <div className="mt-4 flex flex-wrap items-center justify-between gap-3 border-t border-ink-100 pt-4">
        <p className="text-sm text-ink-700">
          {chosen.length} of {group.fees.length} selected · total <strong className="tabular-nums">{formatMoney(total, group.currency)}</strong>
        </p>
        <Button size="lg" onClick={() => void pay()} disabled={chosen.length === 0 || isBusy}>
          {isBusy ? "Opening the checkout…" : `Pay ${formatMoney(total, group.currency)}`}
        </Button>
      </div>
      {error ? (
        <div className="mt-3">
          <Alert tone="danger" live>
            {error}
          </Alert>
        </div>
      ) : null}
      <p className="mt-3 text-xs text-ink-600">You pay on the payment service&apos;s page and come back here. The fee counts as paid once the service confirms it, usually within seconds.</p>
    </Card>
  );
}

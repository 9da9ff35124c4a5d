"use client";

import { useState } from "react";
import { ButtonLink } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import { monthLabel as label } from "@/lib/payments/periods";


export function StatementPicker({ companies, months }: { companies: { id: number; name: string }[]; months: string[] }) {
  const [companyId, setCompanyId] = useState(companies[0]?.id ?? 0);
  const [month, setMonth] = useState(months[0] ?? "");
  if (companies.length === 0) return <p className="text-ink-600">No testing company has filed in this program yet.</p>;
  return (
    <div className="flex flex-wrap items-end gap-3">
      <label className="text-sm font-semibold text-ink-800">
        Company
        <select value={companyId} onChange={(e) => setCompanyId(Number(e.target.value))} className={`${inputClass} mt-1 min-w-64`}>
          {companies.map((c) => (
            <option key={c.id} value={c.id}>
              {c.name}
            </option>
          ))}
        </select>
      </label>
      <label className="text-sm font-semibold text-ink-800">
        Month
        <select value={month} onChange={(e) => setMonth(e.target.value)} className={`${inputClass} mt-1 min-w-48`}>
          {months.map((m) => (
            <option key={m} value={m}>
              {label(m)}
            </option>
          ))}
        </select>
      </label>
      <ButtonLink href={`/api/fees/statements/${companyId}?month=${month}`} variant="secondary">
        Open the statement (PDF)
      </ButtonLink>
    </div>
  );
}

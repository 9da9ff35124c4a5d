"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import { textOf } from "@/components/inspector/json-form";
import { sendJson } from "@/components/inspector/send-json";

export interface PublishedEdition {
  edition: string;
  label: string;
  values: Record<string, number | boolean | null>;
}

export interface ValueRow {
  path: string;
  label: string;
  unit: string;
  kind: "number" | "boolean" | "nullable";
}

/**
 * A program's own rule-set edition: a published edition with some values changed. The server
 * (lib/rules' validateRuleSet) refuses a value less strict than the published one unless the
 * program states its reason for the variance.
 */
export function RuleSetForm({ published, rows, today }: { published: PublishedEdition[]; rows: ValueRow[]; today: string }) {
  const router = useRouter();
  const [basedOn, setBasedOn] = useState(published[0]!.edition);
  const base = published.find((p) => p.edition === basedOn)!;
  const [values, setValues] = useState<Record<string, string | boolean>>({});
  const [reasons, setReasons] = useState<Record<string, string>>({});
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [message, setMessage] = useState<{ tone: "success" | "danger"; text: string } | null>(null);
  const [isBusy, setIsBusy] = useState(false);

  const shown = (row: ValueRow) => {
    if (row.path in values) return values[row.path]!;
    const v = base.values[row.path];
    return row.kind === "boolean" ? Boolean(v) : v === null || v === undefined ? "" : String(v);
  };

  return (
    <form
      className="space-y-4"
      noValidate
      onSubmit={(e) => {
        e.preventDefault();
        const data = new FormData(e.currentTarget);
        const changed: Record<string, number | boolean | null> = {};
        for (const row of rows) {
          if (!(row.path in values)) continue;
          const raw = values[row.path]!;
          changed[row.path] = row.kind === "boolean" ? Boolean(raw) : raw === "" ? null : Number(raw);
        }
        setIsBusy(true);
        void sendJson<{ edition: string }>("POST", "/api/admin/rule-sets", {
          edition: textOf(data, "edition"),
          label: textOf(data, "label"),
          basedOn,
          adoptedOn: textOf(data, "adoptedOn"),
          localSource: textOf(data, "localSource"),
          values: changed,
          variances: Object.entries(reasons)
            .filter(([, reason]) => reason.trim())
            .map(([path, reason]) => ({ path, reason })),
          adopt: data.get("adopt") === "on",
        }).then((result) => {
          setIsBusy(false);
          if (!result.ok) {
            setErrors(result.fieldErrors);
            setMessage({ tone: "danger", text: result.error });
            return;
          }
          setErrors({});
          setMessage({ tone: "success", text: `Edition ${result.data.edition} saved.${data.get("adopt") === "on" ? " It is now the edition in force for new reports." : ""}` });
          router.refresh();
        });
      }}
    >
      <div className="grid gap-4 sm:grid-cols-2">
        <div className="space-y-1">
          <label htmlFor="rs-edition" className="block text-sm font-semibold text-ink-800">
            Edition id
          </label>
          <input id="rs-edition" name="edition" className={inputClass} placeholder="e.g. quillmere-2027" aria-invalid={errors.edition ? true : undefined} />
          {errors.edition ? <p className="text-sm text-fail-700">{errors.edition[0]}</p> : <p className="text-xs text-ink-600">Stored with every report graded under it.</p>}
        </div>
        <div className="space-y-1">
          <label htmlFor="rs-label" className="block text-sm font-semibold text-ink-800">
            Name
          </label>
          <input id="rs-label" name="label" className={inputClass} placeholder="e.g. District minimums adopted 2027" />
          {errors.label ? <p className="text-sm text-fail-700">{errors.label[0]}</p> : null}
        </div>
        <div className="space-y-1">
          <label htmlFor="rs-based" className="block text-sm font-semibold text-ink-800">
            Based on
          </label>
          <select
            id="rs-based"
            className={inputClass}
            value={basedOn}
            onChange={(e) => {
              setBasedOn(e.target.value);
              setValues({});
            }}
          >
            {published.map((p) => (
              <option key={p.edition} value={p.edition}>
                {p.label}
              </option>
            ))}
          </select>
        </div>
        <div className="space-y-1">
          <label htmlFor="rs-adopted" className="block text-sm font-semibold text-ink-800">
            Adopted on
          </label>
          <input id="rs-adopted" name="adoptedOn" type="date" defaultValue={today} className={inputClass} />
          {errors.adoptedOn ? <p className="text-sm text-fail-700">{errors.adoptedOn[0]}</p> : null}
        </div>
        <div className="space-y-1 sm:col-span-2">
          <label htmlFor="rs-source" className="block text-sm font-semibold text-ink-800">
            Where the changed values come from
          </label>
          <input id="rs-source" name="localSource" className={inputClass} placeholder="e.g. District ordinance 14-2, §3 (adopted 12 March 2027)" />
          {errors.localSource ? <p className="text-sm text-fail-700">{errors.localSource[0]}</p> : <p className="text-xs text-ink-600">Shown beside each changed rule on every report, as the published source is.</p>}
        </div>
      </div>
      <div className="overflow-x-auto">
        <table className="w-full text-left text-sm">
          <thead className="border-b border-ink-200 text-xs uppercase tracking-wide text-ink-600">
            <tr>
              <th className="py-2 pr-3">Value</th>
              <th className="py-2 pr-3">Published</th>
              <th className="py-2 pr-3">This edition</th>
              <th className="py-2">Reason, if less strict (a variance)</th>
            </tr>
          </thead>
          <tbody className="divide-y divide-ink-100">
            {rows.map((row) => {
              const published = base.values[row.path];
              const error = errors[row.path]?.[0];
              return (
                <tr key={row.path} className="align-top">
                  <td className="py-2 pr-3">
                    {row.label}
                    <div className="text-xs text-ink-600">{row.path}</div>
                  </td>
                  <td className="py-2 pr-3 tabular-nums">{published === null || published === undefined ? "off" : typeof published === "boolean" ? (published ? "yes" : "no") : `${row.unit === "psid" ? published.toFixed(1) : published} ${row.unit}`}</td>
                  <td className="py-2 pr-3">
                    {row.kind === "boolean" ? (
                      <input type="checkbox" aria-label={row.label} checked={Boolean(shown(row))} onChange={(e) => setValues((v) => ({ ...v, [row.path]: e.target.checked }))} />
                    ) : (
                      <input aria-label={row.label} inputMode="decimal" className={`${inputClass} max-w-28`} placeholder={row.kind === "nullable" ? "off" : ""} value={String(shown(row))} aria-invalid={error ? true : undefined} onChange={(e) => setValues((v) => ({ ...v, [row.path]: e.target.value }))} />
                    )}
                    {error ? <p className="mt-1 max-w-md text-xs text-fail-700">{error}</p> : null}
                  </td>
                  <td className="py-2">
                    <input aria-label={`Variance reason for ${row.label}`} className={inputClass} value={reasons[row.path] ?? ""} onChange={(e) => setReasons((r) => ({ ...r, [row.path]: e.target.value }))} />
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" name="adopt" className="h-4 w-4" /> Put this edition in force for new reports now
      </label>
      {errors.variances ? <Alert tone="danger">{errors.variances[0]}</Alert> : null}
      {message ? (
        <Alert tone={message.tone} live>
          {message.text}
        </Alert>
      ) : null}
      <Button type="submit" disabled={isBusy}>
        {isBusy ? "Checking…" : "Check and save the edition"}
      </Button>
    </form>
  );
}

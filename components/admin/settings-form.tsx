"use client";

import { useRouter } from "next/navigation";
import { useState, type ReactNode } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import { sendJson } from "@/components/inspector/send-json";

export interface SettingsValues {
  testIntervalMonths: number;
  dueModel: "anniversary" | "window";
  windowStart: string;
  windowEnd: string;
  dueSoonDays: number;
  repairDaysSevere: number;
  repairDaysHigh: number;
  repairDaysLow: number;
  reportDeadlineDays: number;
  reminderDaysBefore: number;
  overdueDaysAfter: number;
  finalDaysAfter: number;
  repairReminderDaysBefore: number;
  discontinueDaysAfterFinal: number;
  filingFeeCents: number;
  currency: string;
  units: "psid" | "kPa";
  ruleSetEdition: string;
  kitPolicy: "refuse" | "flag";
}

interface SaveResult {
  changed: string[];
  isRecomputeOwed: boolean;
}

/** "12.50" → 1250; null when it is not an amount with at most two decimals. */
function centsOf(text: string): number | null {
  const match = /^\s*(\d{1,6})(?:[.,](\d{1,2}))?\s*$/.exec(text);
  if (!match) return null;
  return Number(match[1]) * 100 + Number((match[2] ?? "0").padEnd(2, "0"));
}

function Section({ title, description, children }: { title: string; description?: string; children: ReactNode }) {
  return (
    <fieldset className="rounded-lg border border-ink-200 bg-white p-5 shadow-sm">
      <legend className="px-1 text-base font-semibold">{title}</legend>
      {description ? <p className="mb-4 text-sm text-ink-600">{description}</p> : null}
      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">{children}</div>
    </fieldset>
  );
}

export function SettingsForm({ initial, editions }: { initial: SettingsValues; editions: { edition: string; label: string; isPublished: boolean }[] }) {
  const router = useRouter();
  const [values, setValues] = useState<SettingsValues>(initial);
  const [fee, setFee] = useState((initial.filingFeeCents / 100).toFixed(2));
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [message, setMessage] = useState<{ tone: "success" | "danger"; text: string } | null>(null);
  const [isBusy, setIsBusy] = useState(false);

  const set = <K extends keyof SettingsValues>(key: K, value: SettingsValues[K]) => setValues((v) => ({ ...v, [key]: value }));
  const number = (key: keyof SettingsValues, label: string, hint?: string, unit = "days") => {
    const id = `setting-${key}`;
    const error = errors[key]?.[0];
    return (
      <div className="space-y-1">
        <label htmlFor={id} className="block text-sm font-semibold text-ink-800">
          {label}
        </label>
        <div className="flex items-center gap-2">
          <input id={id} type="number" inputMode="numeric" step={1} className={`${inputClass} max-w-32`} value={String(values[key])} aria-invalid={error ? true : undefined} aria-describedby={error ? `${id}-error` : hint ? `${id}-hint` : undefined} onChange={(e) => set(key, (e.target.value === "" ? "" : Number(e.target.value)) as never)} />
          <span className="text-sm text-ink-600">{unit}</span>
        </div>
        {hint ? (
          <p id={`${id}-hint`} className="text-xs text-ink-600">
            {hint}
          </p>
        ) : null}
        {error ? (
          <p id={`${id}-error`} role="alert" className="text-sm font-medium text-fail-700">
            {error}
          </p>
        ) : null}
      </div>
    );
  };

  const save = async () => {
    const cents = centsOf(fee);
    if (cents === null) {
      setErrors({ filingFeeCents: ["Enter the fee as an amount such as 12.50 (0 for none)."] });
      setMessage({ tone: "danger", text: "Please check the highlighted settings." });
      return;
    }
    setIsBusy(true);
    setMessage(null);
    const result = await sendJson<SaveResult>("PUT", "/api/admin/settings", { ...values, filingFeeCents: cents });
    setIsBusy(false);
    if (!result.ok) {
      setErrors(result.fieldErrors);
      setMessage({ tone: "danger", text: result.error });
      return;
    }
    setErrors({});
    const r = result.data;
    setMessage({
      tone: "success",
      text:
        (r.changed.length === 0 ? "Nothing had changed." : `Saved (${r.changed.length} setting${r.changed.length === 1 ? "" : "s"} changed).`) +
        (r.isRecomputeOwed ? " Every assembly's due date and repair deadline is now recomputed; the top of the page shows the progress while that runs." : ""),
    });
    router.refresh();
  };

  return (
    <form
      className="space-y-6"
      noValidate
      onSubmit={(e) => {
        e.preventDefault();
        void save();
      }}
    >
      <Section title="When tests are due" description="A change here moves stored due dates: every assembly's facts are recomputed when you save.">
        {number("testIntervalMonths", "Test interval", "At least once a year (Washington WAC 246-290-490(7)(b)); some programs allow 24 months for low-hazard residential assemblies.", "months")}
        <div className="space-y-1">
          <span className="block text-sm font-semibold text-ink-800">Due-date model</span>
          <label className="flex items-center gap-2 text-sm">
            <input type="radio" name="dueModel" checked={values.dueModel === "anniversary"} onChange={() => set("dueModel", "anniversary")} /> Anniversary of the last passing test
          </label>
          <label className="flex items-center gap-2 text-sm">
            <input type="radio" name="dueModel" checked={values.dueModel === "window"} onChange={() => set("dueModel", "window")} /> A fixed yearly window
          </label>
          {errors.dueModel ? <p className="text-sm text-fail-700">{errors.dueModel[0]}</p> : null}
        </div>
        {values.dueModel === "window" ? (
          <div className="grid grid-cols-2 gap-2">
            {(["windowStart", "windowEnd"] as const).map((key) => (
              <div key={key} className="space-y-1">
                <label htmlFor={`setting-${key}`} className="block text-sm font-semibold text-ink-800">
                  {key === "windowStart" ? "Window opens" : "Window closes"}
                </label>
                <input id={`setting-${key}`} className={inputClass} placeholder="MM-DD" value={values[key]} onChange={(e) => set(key, e.target.value)} aria-invalid={errors[key] ? true : undefined} />
                {errors[key] ? <p className="text-sm text-fail-700">{errors[key][0]}</p> : null}
              </div>
            ))}
          </div>
        ) : (
          <div />
        )}
        {number("dueSoonDays", "“Due soon” from", "Days before the due date; the compliance picture counts these as due soon.")}
        {number("reportDeadlineDays", "Report deadline after a test", "Local rules say 5 to 30 days; reports filed later are flagged.")}
      </Section>

      <Section title="Repair deadlines after a failed test" description="Days from the first failed test to the repair and passing retest, by degree of hazard (e.g. 7 for a health hazard and 21 otherwise; 14, 15, 30 or 60 elsewhere).">
        {number("repairDaysSevere", "Severe health hazard")}
        {number("repairDaysHigh", "High health hazard")}
        {number("repairDaysLow", "Low hazard")}
      </Section>

      <Section title="Owner notices" description="Checked for order: the reminder comes before the due date, the overdue notice at least a day after it, the final notice after the overdue notice.">
        {number("reminderDaysBefore", "First reminder", "Days before the due date (30–45 is common).")}
        {number("overdueDaysAfter", "Overdue notice", "Days after the due date (at least 1).")}
        {number("finalDaysAfter", "Final notice", "Days after the due date.")}
        {number("repairReminderDaysBefore", "Repair reminder", "Days before the repair deadline.")}
        {number("discontinueDaysAfterFinal", "Service may be discontinued", "Days after the final notice; the notice names the date.")}
      </Section>

      <Section title="Filing fee and units">
        <div className="space-y-1">
          <label htmlFor="setting-fee" className="block text-sm font-semibold text-ink-800">
            Filing fee per report
          </label>
          <div className="flex items-center gap-2">
            <input id="setting-fee" inputMode="decimal" className={`${inputClass} max-w-32`} value={fee} onChange={(e) => setFee(e.target.value)} aria-invalid={errors.filingFeeCents ? true : undefined} />
            <input aria-label="Currency" className={`${inputClass} max-w-20 uppercase`} maxLength={3} value={values.currency} onChange={(e) => set("currency", e.target.value.toUpperCase())} />
          </div>
          <p className="text-xs text-ink-600">0 means no fee.</p>
          {errors.filingFeeCents ? <p className="text-sm text-fail-700">{errors.filingFeeCents[0]}</p> : null}
          {errors.currency ? <p className="text-sm text-fail-700">{errors.currency[0]}</p> : null}
        </div>
        <div className="space-y-1">
          <span className="block text-sm font-semibold text-ink-800">Units of the readings</span>
          <label className="flex items-center gap-2 text-sm">
            <input type="radio" name="units" checked={values.units === "psid"} onChange={() => set("units", "psid")} /> psid
          </label>
          <label className="flex items-center gap-2 text-sm">
            <input type="radio" name="units" checked={values.units === "kPa"} onChange={() => set("units", "kPa")} /> kPa (converted exactly: 1 psi = 6.894 757 kPa, NIST SP 811)
          </label>
        </div>
      </Section>

      <Section title="Grading" description="The rule-set edition new reports are graded against; reports already filed keep the edition they were graded with.">
        <div className="space-y-1 sm:col-span-2">
          <label htmlFor="setting-edition" className="block text-sm font-semibold text-ink-800">
            Rule-set edition in force
          </label>
          <select id="setting-edition" className={inputClass} value={values.ruleSetEdition} onChange={(e) => set("ruleSetEdition", e.target.value)}>
            <optgroup label="Published editions">
              {editions
                .filter((e) => e.isPublished)
                .map((e) => (
                  <option key={e.edition} value={e.edition}>
                    {e.label}
                  </option>
                ))}
            </optgroup>
            {editions.some((e) => !e.isPublished) ? (
              <optgroup label="The program's own editions">
                {editions
                  .filter((e) => !e.isPublished)
                  .map((e) => (
                    <option key={e.edition} value={e.edition}>
                      {e.label} ({e.edition})
                    </option>
                  ))}
              </optgroup>
            ) : null}
          </select>
          {errors.ruleSetEdition ? <p className="text-sm text-fail-700">{errors.ruleSetEdition[0]}</p> : null}
        </div>
        <div className="space-y-1">
          <span className="block text-sm font-semibold text-ink-800">Kit accuracy check out of date</span>
          <label className="flex items-center gap-2 text-sm">
            <input type="radio" name="kitPolicy" checked={values.kitPolicy === "refuse"} onChange={() => set("kitPolicy", "refuse")} /> Refuse the report
          </label>
          <label className="flex items-center gap-2 text-sm">
            <input type="radio" name="kitPolicy" checked={values.kitPolicy === "flag"} onChange={() => set("kitPolicy", "flag")} /> Accept it, flagged for the inspector
          </label>
        </div>
      </Section>

      {message ? (
        <Alert tone={message.tone} live>
          {message.text}
        </Alert>
      ) : null}
      <div className="flex gap-2">
        <Button type="submit" disabled={isBusy}>
          {isBusy ? "Saving… (recomputing due dates if needed)" : "Save the settings"}
        </Button>
        <Button
          variant="secondary"
          disabled={isBusy}
          onClick={() => {
            setValues(initial);
            setFee((initial.filingFeeCents / 100).toFixed(2));
            setErrors({});
            setMessage(null);
          }}
        >
          Undo my changes
        </Button>
      </div>
    </form>
  );
}

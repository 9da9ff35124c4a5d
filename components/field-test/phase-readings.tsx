"use client";

import { useMemo } from "react";
import { gaugeRangeIn, minimumsFor, parseReadingText, readingFieldsFor, type PhaseDraft, type PhaseGrade } from "@/lib/forms/readings";
import { formatMinimum, type AssemblyKind, type ReadingUnit, type RuleSet } from "@/lib/rules";
import { GradeNote } from "./grade-note";
import { YesNo } from "./yes-no";

const outcomeStyles = {
  pass: "border-pass-600 bg-pass-50 text-pass-700",
  fail: "border-fail-600 bg-fail-50 text-fail-700",
  incomplete: "border-ink-200 bg-white text-ink-800",
} as const;

/** One phase's readings (the initial test or the retest), each graded live beside its input. */
export function PhaseReadings({
  phaseKey,
  title,
  kind,
  unit,
  ruleSet,
  phase,
  grade,
  errors,
  onChange,
}: {
  phaseKey: "initial" | "retest";
  title: string;
  kind: AssemblyKind;
  unit: ReadingUnit;
  ruleSet: RuleSet;
  phase: PhaseDraft;
  grade: PhaseGrade;
  /** Messages to show, keyed "initial.check1Differential" etc. */
  errors: Record<string, string>;
  onChange: (mutate: (phase: PhaseDraft) => void) => void;
}) {
  const specs = useMemo(() => readingFieldsFor(kind, ruleSet), [kind, ruleSet]);
  const pipe = parseReadingText(phase.text.supplyPipeDiameterInches, "inches", unit, ruleSet);
  const pipeDiameterInches = pipe.state === "ok" ? pipe.value : undefined;
  const isNearSideWall = phase.flags.nearSideWall;
  const minimums = useMemo(() => minimumsFor(kind, unit, ruleSet, { pipeDiameterInches, isNearSideWall }), [kind, unit, ruleSet, pipeDiameterInches, isNearSideWall]);
  const isAirGap = kind === "AG";
  const unitWord = isAirGap ? "in." : unit;
  const range = gaugeRangeIn(unit, ruleSet);
  const remaining = grade.missing.length;
  const outcomeText =
    grade.outcome === "pass" ? "Pass: every minimum met" : grade.outcome === "fail" ? "Fail" : `${remaining} reading${remaining === 1 ? "" : "s"} to go`;

  return (
    <section aria-labelledby={`${phaseKey}-title`} className="rounded-lg border border-ink-200 bg-white shadow-sm" data-phase={phaseKey}>
      <header className="flex flex-wrap items-center justify-between gap-2 border-b border-ink-100 px-4 py-3 sm:px-5">
        <h2 id={`${phaseKey}-title`} className="text-lg font-semibold">
          {title}
        </h2>
        <span className={`rounded-full border px-3 py-1 text-sm font-bold ${outcomeStyles[grade.outcome]}`} data-testid={`${phaseKey}-outcome`} data-outcome={grade.outcome} aria-live="polite">
          {outcomeText}
        </span>
      </header>
      <div className="divide-y divide-ink-100">
        {specs.map((spec) => {
          const id = `${phaseKey}-${spec.field}`;
          const errorKey = `${phaseKey}.${spec.field}`;
          const error = errors[errorKey];
          const hintId = `${id}-hint`;
          const gradeId = `${id}-grade`;
          const errorId = `${id}-error`;
          const describedBy = [hintId, error ? errorId : null, gradeId].filter(Boolean).join(" ");
          const findings = grade.findingsByField[spec.field];
          const didNotOpen = Boolean(phase.didNotOpen[spec.field]);
          return (
            <div key={spec.field} id={`${id}-row`} className="space-y-2 px-4 py-4 sm:px-5">
              <div>
                {spec.type === "flag" ? (
                  <p id={`${id}-label`} className="text-base font-semibold text-ink-900">
                    {spec.label}
                    {spec.isRequired ? <span className="text-fail-600"> *</span> : null}
                  </p>
                ) : (
                  <label htmlFor={id} className="text-base font-semibold text-ink-900">
                    {spec.label}
                    {spec.isRequired ? <span className="text-fail-600"> *</span> : null}
                  </label>
                )}
                <p id={hintId} className="text-sm text-ink-600">
                  {spec.hint}
                  {spec.type === "differential" ? ` One decimal, ${unit} (gauge range 0–${formatMinimum(range)}).` : ""}
                </p>
              </div>
              {spec.type === "flag" ? (
                <YesNo
                  id={id}
                  label={spec.label}
                  value={phase.flags[spec.field]}
                  yes={spec.answers?.yes}
                  no={spec.answers?.no}
                  isInvalid={Boolean(error)}
                  describedBy={describedBy}
                  onChange={(value) =>
                    onChange((p) => {
                      p.flags[spec.field] = value;
                    })
                  }
                />
              ) : (
                <div className="flex flex-wrap items-center gap-3">
                  <div className="flex items-center gap-2">
                    <input
                      id={id}
                      name={id}
                      type="text"
                      inputMode="decimal"
                      autoComplete="off"
                      enterKeyHint="next"
                      spellCheck={false}
                      disabled={didNotOpen}
                      value={didNotOpen ? "" : (phase.text[spec.field] ?? "")}
                      placeholder={didNotOpen ? "—" : "0.0"}
                      aria-invalid={Boolean(error) || undefined}
                      aria-describedby={describedBy}
                      onChange={(event) => {
                        const text = event.target.value.slice(0, 12);
                        onChange((p) => {
                          p.text[spec.field] = text;
                        });
                      }}
                      className="h-14 w-36 rounded-md border-2 border-ink-200 bg-white px-3 text-right text-2xl font-semibold tabular-nums text-ink-900 shadow-sm focus:border-estuary-600 focus:outline-2 focus:outline-estuary-600 aria-[invalid=true]:border-fail-600 disabled:bg-ink-100"
                    />
                    <span className="text-lg font-semibold text-ink-600">{unitWord}</span>
                  </div>
                  {spec.canFailToOpen ? (
                    <label className={`flex min-h-12 cursor-pointer items-center gap-3 rounded-md border-2 px-3 py-2 font-semibold ${didNotOpen ? "border-fail-600 bg-fail-50 text-fail-700" : "border-ink-200 bg-white text-ink-800"}`}>
                      <input
                        type="checkbox"
                        className="h-6 w-6 shrink-0 accent-fail-600"
                        checked={didNotOpen}
                        onChange={(event) => {
                          const checked = event.target.checked;
                          onChange((p) => {
                            p.didNotOpen[spec.field] = checked;
                          });
                        }}
                      />
                      Did not open
                    </label>
                  ) : null}
                </div>
              )}
              {error ? (
                <p id={errorId} role="alert" className="text-sm font-semibold text-fail-700">
                  {error}
                </p>
              ) : null}
              <GradeNote id={gradeId} findings={findings} minimums={minimums[spec.field]} />
            </div>
          );
        })}
      </div>
    </section>
  );
}

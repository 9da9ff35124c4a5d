"use client";

import { useEffect, useMemo, useRef, useState } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import type { DraftDto } from "@/lib/data/drafts";
import type { FieldTestContext } from "@/lib/data/tester-field-test";
import { describeSaveStatus, findResumableDraft, interpretSubmitResponse, pickFresherDraft, type StoredDraft } from "@/lib/forms/draft-sync";
import { buildSubmission, evaluateDraft, newDraft, parseLinePressure, type DraftContext, type FieldTestDraft } from "@/lib/forms/field-test-draft";
import { componentLabels, type ComponentRepairDraft, type RepairComponent } from "@/lib/forms/repairs";
import { installationKinds, installationLabels, reasonLabels, testReasons } from "@/lib/forms/report-options";
import { todayInZone } from "@/lib/programs/settings";
import { addDays, assemblyKindLabels, familyOf, fieldLabels, hazardLabels, type FieldTestField } from "@/lib/rules";
import { newClientKey } from "./client-keys";
import { PhaseReadings } from "./phase-readings";
import { RepairsEditor, SafetyCautions } from "./repairs-section";
import { readLocalDrafts, useDraftSync } from "./use-draft-sync";
import { YesNo } from "./yes-no";

function timeInZone(timezone: string, now = new Date()): string {
  const parts = new Intl.DateTimeFormat("en-GB", { timeZone: timezone, hour: "2-digit", minute: "2-digit", hourCycle: "h23" }).formatToParts(now);
  const get = (type: string) => parts.find((p) => p.type === type)?.value ?? "00";
  return `${get("hour")}:${get("minute")}`;
}

function freshStart(context: FieldTestContext): StoredDraft {
  const { assembly, program, basis, kits } = context;
  const data: FieldTestDraft = basis
    ? structuredClone(basis.prefill)
    : newDraft({
        assemblyId: assembly.id,
        kind: assembly.kind,
        unit: program.units,
        testedOn: todayInZone(program.timezone),
        testedTime: timeInZone(program.timezone),
        kitId: kits.length === 1 ? kits[0]!.id : null,
        reason: context.suggestedReason,
      });
  return { clientKey: newClientKey(), clientRevision: 0, savedAt: new Date().toISOString(), serverRevision: null, submitKey: newClientKey(), data };
}

/**
 * The field test for one assembly. Before the form shows, the phone's own copy and the server's
 * copy of an unfinished test are compared and the fresher one is resumed.
 */
export function FieldTestForm({ context, serverDrafts }: { context: FieldTestContext; serverDrafts: DraftDto[] }) {
  const [start, setStart] = useState<{ stored: StoredDraft; resumedFrom: "phone" | "server" | null } | null>(null);
  useEffect(() => {
    const target = { assemblyId: context.assembly.id, correctsReportId: context.basis?.kind === "correction" ? context.basis.reportId : null, amendsReportId: context.basis?.kind === "amendment" ? context.basis.reportId : null };
    const local = findResumableDraft(readLocalDrafts(context.tester.id), target);
    const serverMatch = serverDrafts.find((d) => d.data.correctsReportId === target.correctsReportId && d.data.amendsReportId === target.amendsReportId) ?? null;
    const sameServer = local ? (serverDrafts.find((d) => d.clientKey === local.clientKey) ?? null) : serverMatch;
    const server: StoredDraft | null = sameServer ? { clientKey: sameServer.clientKey, clientRevision: sameServer.clientRevision, savedAt: sameServer.updatedAt, serverRevision: sameServer.clientRevision, submitKey: local?.clientKey === sameServer.clientKey ? local.submitKey : newClientKey(), data: sameServer.data } : null;
    const chosen = pickFresherDraft(local, server);
    // Initialising from the browser's own storage is only possible once mounted.
    setStart(chosen ? { stored: chosen, resumedFrom: chosen === local ? "phone" : "server" } : { stored: freshStart(context), resumedFrom: null });
  }, [context, serverDrafts]);

  if (!start) {
    return (
      <p className="rounded-lg border border-ink-200 bg-white px-4 py-6 text-ink-600" role="status">
        Opening the test…
      </p>
    );
  }
  return (
    <FieldTestEditor
      key={start.stored.clientKey}
      context={context}
      start={start.stored}
      resumedFrom={start.resumedFrom}
      onStartOver={() => setStart({ stored: freshStart(context), resumedFrom: null })}
    />
  );
}

const serverKeyToFormKey = (key: string): string => {
  if (key === "attestation.name") return "attestationName";
  if (key === "attestation.confirmed") return "attestationConfirmed";
  if (/^repairs\.\d+/.test(key)) return "repairs";
  return key;
};

const topLevelLabels: Record<string, string> = {
  testedOn: "Test date",
  testedTime: "Time",
  reason: "Reason",
  reasonNote: "Reason",
  previousSerial: "Replaced serial",
  linePressure: "Line pressure",
  kitId: "Test kit",
  certification: "Certification",
  repairChoice: "Repairs",
  repairs: "Repairs",
  attestationName: "Your name",
  attestationConfirmed: "Attestation",
  unit: "Units",
};

/** "Retest, Check #1 differential" — which field a message in the list of problems is about. */
function labelFor(key: string): string {
  const [head, field] = key.split(".");
  if ((head === "initial" || head === "retest") && field) return `${head === "initial" ? "Initial test" : "Retest"}, ${fieldLabels[field as FieldTestField] ?? field}`;
  if (head === "repairs" && field) return `Repairs, ${componentLabels[field as RepairComponent] ?? field}`;
  return topLevelLabels[key] ?? key;
}

/** Where each message's field is, for the list of problems above the submit button. */
function anchorFor(key: string): string {
  const [head, field] = key.split(".");
  if ((head === "initial" || head === "retest") && field) return `#${head}-${field}-row`;
  if (head === "repairs") return field ? `#repairs-${field}` : "#repairs";
  if (key === "certification" || key === "kitId") return "#credentials";
  return `#field-${key}`;
}

/** Messages about what was typed show at once; "still missing" ones wait for a submit attempt. */
const isImmediateError = (key: string, draft: FieldTestDraft, evaluation: ReturnType<typeof evaluateDraft>) => {
  const [phase, field] = key.split(".");
  if (phase === "initial" && field) return field in evaluation.initial.errors;
  if (phase === "retest" && field) return Boolean(evaluation.retest && field in evaluation.retest.errors);
  if (key === "linePressure") return draft.linePressure.trim() !== "";
  if (key === "testedOn") return draft.testedOn !== "";
  return false;
};

function FieldTestEditor({ context, start, resumedFrom, onStartOver }: { context: FieldTestContext; start: StoredDraft; resumedFrom: "phone" | "server" | null; onStartOver: () => void }) {
  const sync = useDraftSync(context.tester.id, start);
  const { draft, update } = sync;
  const { assembly, program, tester, kits, basis } = context;
  const [showAllErrors, setShowAllErrors] = useState(false);
  const [serverErrors, setServerErrors] = useState<Record<string, string>>({});
  const [submitMessage, setSubmitMessage] = useState<{ tone: "danger" | "warning"; text: string } | null>(null);
  const [isSubmitting, setSubmitting] = useState(false);
  const [confirming, setConfirming] = useState<null | "start_over" | "discard">(null);
  const [today, setToday] = useState(() => todayInZone(program.timezone));
  const problemsRef = useRef<HTMLDivElement>(null);

  useEffect(() => {
    // Past midnight the program's "today" moves on (a test date in the future is refused).
    const id = setInterval(() => setToday(todayInZone(program.timezone)), 60_000);
    return () => clearInterval(id);
  }, [program.timezone]);

  const draftContext: DraftContext = useMemo(
    () => ({
      ruleSet: program.ruleSet,
      today,
      kitPolicy: program.kitPolicy,
      installedOn: assembly.installedOn,
      removedOn: assembly.removedOn,
      testerName: tester.name,
      certification: tester.certification ? { expiresOn: tester.certification.expiresOn, issuedOn: tester.certification.issuedOn } : null,
      kits,
    }),
    [program.ruleSet, today, program.kitPolicy, assembly.installedOn, assembly.removedOn, tester, kits],
  );
  const evaluation = useMemo(() => evaluateDraft(draft, draftContext), [draft, draftContext]);
  const isAirGap = familyOf(assembly.kind) === "ag";
  const isRp = familyOf(assembly.kind) === "rp";

  const errors: Record<string, string> = {};
  for (const [key, message] of Object.entries(evaluation.errors)) if (showAllErrors || isImmediateError(key, draft, evaluation)) errors[key] = message;
  for (const [key, message] of Object.entries(serverErrors)) errors[key] ??= message;

  const change = (mutate: (d: FieldTestDraft) => void) => {
    setServerErrors({});
    update(mutate);
  };
  const status = describeSaveStatus({ hasLocalCopy: sync.hasLocalCopy, isLocalStorageAvailable: sync.isLocalStorageAvailable, server: sync.serverState, isDirty: sync.isDirty, lastServerSave: sync.lastServerSave });
  const statusTone = { pass: "text-pass-700", caution: "text-caution-700", fail: "text-fail-700", muted: "text-ink-600" }[status.tone];
  const finalWord =
    evaluation.finalOutcome === "pass"
      ? evaluation.isRetestShown
        ? "Passed after repair"
        : "Pass"
      : evaluation.finalOutcome === "fail"
        ? evaluation.needsRepairChoice && draft.repairChoice === "not_repaired"
          ? "Fail: filed as failed"
          : evaluation.isRetestShown && evaluation.retest?.outcome === "fail"
            ? "Fail after repair"
            : "Fail"
        : "In progress";
  const finalTone = evaluation.finalOutcome === "pass" ? "bg-pass-600 text-white" : evaluation.finalOutcome === "fail" ? "bg-fail-600 text-white" : "bg-ink-200 text-ink-800";
  const repairDueOn = addDays(draft.testedOn && /^\d{4}-\d{2}-\d{2}$/.test(draft.testedOn) ? draft.testedOn : today, program.repairDays);

  async function submit() {
    setShowAllErrors(true);
    setSubmitMessage(null);
    if (!evaluation.canSubmit) {
      setSubmitMessage({ tone: "danger", text: "The report is not complete yet: see the list below." });
      requestAnimationFrame(() => problemsRef.current?.focus());
      return;
    }
    setSubmitting(true);
    await sync.pause();
    const body = buildSubmission(draft, draftContext, { idempotencyKey: start.submitKey, draftKey: start.clientKey });
    let status: number | null = null;
    let json: unknown = null;
    try {
      const response = await fetch("/api/reports", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
      status = response.status;
      json = await response.json().catch(() => null);
    } catch {
      status = null;
    }
    const outcome = interpretSubmitResponse(status, json);
    if (outcome.kind === "submitted") {
      sync.forgetLocally();
      window.location.assign(`/tester/reports/${outcome.reportId}?filed=1`);
      return;
    }
    setSubmitting(false);
    sync.resume();
    if (outcome.kind === "invalid") {
      const mapped: Record<string, string> = {};
      for (const [key, messages] of Object.entries(outcome.fieldErrors)) if (messages[0]) mapped[serverKeyToFormKey(key)] = messages[0];
      setServerErrors(mapped);
      setSubmitMessage({ tone: "danger", text: outcome.message });
    } else setSubmitMessage({ tone: "warning", text: outcome.message });
  }

  const problemList = Object.entries(errors);
  const kitStatus = evaluation.credentials;

  return (
    <div className="space-y-5 pb-24">
      {/* A slim bar that stays in view on a phone: what is being tested, the result so far, where the draft is. */}
      <div className="sticky top-0 z-10 -mx-4 border-b border-ink-200 bg-white/95 px-4 py-2 shadow-sm backdrop-blur sm:mx-0 sm:rounded-lg sm:border">
        <div className="flex flex-wrap items-center justify-between gap-2">
          <p className="min-w-0 truncate font-semibold">
            {assembly.kind} · {assembly.serial || "no serial"} · {assembly.site.addressLine1}
          </p>
          <span className={`rounded-full px-3 py-1 text-sm font-bold ${finalTone}`} data-testid="final-outcome">
            {finalWord}
          </span>
        </div>
        <p className={`text-sm ${statusTone}`} role="status" data-testid="save-status" data-server={sync.serverState}>
          {status.text}
        </p>
        {evaluation.credentials.blocking.length ? (
          <p className="text-sm font-semibold text-fail-700">
            <a href="#credentials" className="text-fail-700">
              ⚠ Cannot be submitted: {evaluation.credentials.blocking[0]!.field === "certification" ? "certification" : "test kit"} not valid on the test date
            </a>
          </p>
        ) : null}
      </div>

      {resumedFrom ? (
        <Alert tone="info" title={resumedFrom === "phone" ? "Continuing the test saved on this phone" : "Continuing the test saved on the server"}>
          Everything typed so far is back. <button type="button" className="font-semibold underline" onClick={() => setConfirming("start_over")}>Start over instead</button>
        </Alert>
      ) : null}

      {basis ? (
        <Alert tone={basis.kind === "correction" ? "warning" : "info"} title={basis.kind === "correction" ? `Correcting ${basis.reportNumber} (returned)` : `Amending ${basis.reportNumber} (accepted)`}>
          {basis.kind === "correction" ? (
            <>
              <p>Your correction is filed as revision {basis.revision + 1} of the same report; the returned revision stays on record.</p>
              {basis.reasons.length ? (
                <ul className="mt-1 list-disc pl-5">
                  {basis.reasons.map((reason) => (
                    <li key={reason}>{reason}</li>
                  ))}
                </ul>
              ) : null}
              {basis.note ? <p className="mt-1 italic">“{basis.note}”</p> : null}
            </>
          ) : (
            <p>An accepted report cannot be edited. This is filed as a new report that amends it; say in the remarks what changed.</p>
          )}
        </Alert>
      ) : null}

      <section aria-labelledby="assembly-title" className="rounded-lg border border-ink-200 bg-white px-4 py-4 shadow-sm sm:px-5">
        <h2 id="assembly-title" className="text-lg font-semibold">
          {assemblyKindLabels[assembly.kind]} ({assembly.kind})
        </h2>
        <dl className="mt-2 grid grid-cols-1 gap-x-6 gap-y-1 text-sm sm:grid-cols-2">
          <div>
            <dt className="inline text-ink-600">Site: </dt>
            <dd className="inline font-medium">
              {assembly.site.name}, {assembly.site.addressLine1}, {assembly.site.city}
            </dd>
          </div>
          <div>
            <dt className="inline text-ink-600">Account: </dt>
            <dd className="inline font-medium">
              {assembly.site.accountNumber} · {program.shortName}
            </dd>
          </div>
          <div>
            <dt className="inline text-ink-600">Make / model / size: </dt>
            <dd className="inline font-medium">{[assembly.make, assembly.model, assembly.size].filter(Boolean).join(" · ") || "—"}</dd>
          </div>
          <div>
            <dt className="inline text-ink-600">Serial / tag: </dt>
            <dd className="inline font-medium">
              {assembly.serial || "—"} · {assembly.tagNumber}
            </dd>
          </div>
          <div>
            <dt className="inline text-ink-600">Location: </dt>
            <dd className="inline font-medium">{assembly.location || "—"}</dd>
          </div>
          <div>
            <dt className="inline text-ink-600">Hazard / last test: </dt>
            <dd className="inline font-medium">
              {hazardLabels[assembly.hazard]} · {assembly.lastTestedOn ? `${assembly.lastTestedOn} (${assembly.lastOutcome === "pass" ? "passed" : "failed"})` : "never tested"}
            </dd>
          </div>
          {assembly.site.contactName ? (
            <div>
              <dt className="inline text-ink-600">Site contact: </dt>
              <dd className="inline font-medium">
                {assembly.site.contactName}
                {assembly.site.contactPhone ? `, ${assembly.site.contactPhone}` : ""}
              </dd>
            </div>
          ) : null}
        </dl>
        {assembly.status === "awaiting_confirmation" ? <p className="mt-2 text-sm text-caution-700">Registered from the field; the program will confirm it. Its first report can be filed now.</p> : null}
      </section>

      <section id="credentials" aria-labelledby="credentials-title" className="rounded-lg border border-ink-200 bg-white px-4 py-4 shadow-sm sm:px-5">
        <h2 id="credentials-title" className="text-lg font-semibold">
          Certification and test kit
        </h2>
        {kitStatus.blocking.length ? (
          <div className="mt-3">
            <Alert tone="danger" title="You cannot submit this report" live>
              <ul className="list-disc pl-5">
                {kitStatus.blocking.map((problem) => (
                  <li key={problem.message}>{problem.message}</li>
                ))}
              </ul>
              <p className="mt-1">
                Update your <a href="/tester/credentials">credentials and kits</a> first; the draft is kept meanwhile.
              </p>
            </Alert>
          </div>
        ) : null}
        {kitStatus.warnings.length ? (
          <div className="mt-3">
            <Alert tone="warning">
              {kitStatus.warnings.map((w) => (
                <p key={w.message}>{w.message} The inspector will see this.</p>
              ))}
            </Alert>
          </div>
        ) : null}
        <p className="mt-3 text-sm">
          {tester.certification ? (
            <>
              <span className="text-ink-600">Certificate </span>
              <span className="font-semibold">{tester.certification.number}</span>
              <span className="text-ink-600">
                {" "}
                ({tester.certification.certifyingBody}), expires {tester.certification.expiresOn}
              </span>
            </>
          ) : (
            <span className="font-semibold text-fail-700">No certification on file.</span>
          )}
        </p>
        <fieldset className="mt-3" id="field-kitId">
          <legend className="text-base font-semibold">
            Test kit used <span className="text-fail-600">*</span>
          </legend>
          {kits.length === 0 ? <p className="text-sm text-fail-700">No kit on file: add one on the credentials page.</p> : null}
          <div className="mt-2 grid gap-2 sm:grid-cols-2">
            {kits.map((kit) => {
              const isChosen = draft.kitId === kit.id;
              return (
                <label key={kit.id} className={`flex min-h-12 cursor-pointer items-start gap-3 rounded-md border-2 px-3 py-2 ${isChosen ? "border-estuary-700 bg-estuary-50" : "border-ink-200 bg-white"}`}>
                  <input
                    type="radio"
                    name="kitId"
                    className="mt-1 h-5 w-5 shrink-0 accent-estuary-700"
                    checked={isChosen}
                    onChange={() =>
                      change((d) => {
                        d.kitId = kit.id;
                      })
                    }
                  />
                  <span>
                    <span className="block font-semibold">
                      {kit.make} {kit.model}
                    </span>
                    <span className="block text-sm text-ink-600">
                      Serial {kit.serial} · checked {kit.lastVerifiedOn}
                      {kit.verificationResult === "failed" ? " (failed)" : ""}
                    </span>
                  </span>
                </label>
              );
            })}
          </div>
          {errors.kitId && !kitStatus.blocking.some((b) => b.field === "kitId") ? (
            <p role="alert" className="mt-1 text-sm font-semibold text-fail-700">
              {errors.kitId}
            </p>
          ) : null}
          {kitStatus.kitValidUntil && !kitStatus.blocking.length ? <p className="mt-1 text-sm text-ink-600">This kit&apos;s accuracy check covers tests until {kitStatus.kitValidUntil}.</p> : null}
        </fieldset>
      </section>

      <section aria-labelledby="details-title" className="rounded-lg border border-ink-200 bg-white px-4 py-4 shadow-sm sm:px-5">
        <h2 id="details-title" className="text-lg font-semibold">
          The test
        </h2>
        <div className="mt-3 grid gap-4 sm:grid-cols-2">
          <div>
            <label htmlFor="field-testedOn" className="block text-sm font-semibold">
              Test date <span className="text-fail-600">*</span>
            </label>
            <input
              id="field-testedOn"
              type="date"
              max={today}
              value={draft.testedOn}
              aria-invalid={Boolean(errors.testedOn) || undefined}
              onChange={(e) => {
                const value = e.target.value;
                change((d) => {
                  d.testedOn = value;
                });
              }}
              className={`${inputClass} min-h-12 text-lg`}
            />
            {errors.testedOn ? (
              <p role="alert" className="mt-1 text-sm font-semibold text-fail-700">
                {errors.testedOn}
              </p>
            ) : null}
          </div>
          <div>
            <label htmlFor="field-testedTime" className="block text-sm font-semibold">
              Time <span className="text-fail-600">*</span>
            </label>
            <input
              id="field-testedTime"
              type="time"
              value={draft.testedTime}
              aria-invalid={Boolean(errors.testedTime) || undefined}
              onChange={(e) => {
                const value = e.target.value;
                change((d) => {
                  d.testedTime = value;
                });
              }}
              className={`${inputClass} min-h-12 text-lg`}
            />
            {errors.testedTime ? (
              <p role="alert" className="mt-1 text-sm font-semibold text-fail-700">
                {errors.testedTime}
              </p>
            ) : null}
          </div>
        </div>

        <fieldset className="mt-4" id="field-reason">
          <legend className="text-sm font-semibold">
            Why it was tested <span className="text-fail-600">*</span>
          </legend>
          <div className="mt-2 grid grid-cols-2 gap-2 sm:grid-cols-3">
            {testReasons.map((reason) => (
              <label key={reason} className={`flex min-h-12 cursor-pointer items-center gap-2 rounded-md border-2 px-3 py-2 text-sm font-semibold ${draft.reason === reason ? "border-estuary-700 bg-estuary-50" : "border-ink-200 bg-white"}`}>
                <input
                  type="radio"
                  name="reason"
                  className="h-5 w-5 shrink-0 accent-estuary-700"
                  checked={draft.reason === reason}
                  onChange={() =>
                    change((d) => {
                      d.reason = reason;
                      if (reason === "installation" && d.installation === "existing") d.installation = "new";
                    })
                  }
                />
                {reasonLabels[reason]}
              </label>
            ))}
          </div>
          {errors.reason ? (
            <p role="alert" className="mt-1 text-sm font-semibold text-fail-700">
              {errors.reason}
            </p>
          ) : null}
        </fieldset>
        {draft.reason === "other" ? (
          <div className="mt-3">
            <label htmlFor="field-reasonNote" className="block text-sm font-semibold">
              The reason <span className="text-fail-600">*</span>
            </label>
            <input
              id="field-reasonNote"
              maxLength={300}
              value={draft.reasonNote}
              onChange={(e) => {
                const value = e.target.value;
                change((d) => {
                  d.reasonNote = value;
                });
              }}
              className={`${inputClass} min-h-12`}
            />
            {errors.reasonNote ? (
              <p role="alert" className="mt-1 text-sm font-semibold text-fail-700">
                {errors.reasonNote}
              </p>
            ) : null}
          </div>
        ) : null}

        <div className="mt-4 grid gap-4 sm:grid-cols-2">
          <div>
            <label htmlFor="field-installation" className="block text-sm font-semibold">
              Installation
            </label>
            <select
              id="field-installation"
              value={draft.installation}
              onChange={(e) => {
                const value = e.target.value as FieldTestDraft["installation"];
                change((d) => {
                  d.installation = value;
                });
              }}
              className={`${inputClass} min-h-12`}
            >
              {installationKinds.map((kind) => (
                <option key={kind} value={kind}>
                  {installationLabels[kind]}
                </option>
              ))}
            </select>
          </div>
          {draft.installation === "replacement" ? (
            <div>
              <label htmlFor="field-previousSerial" className="block text-sm font-semibold">
                Serial of the assembly it replaces <span className="text-fail-600">*</span>
              </label>
              <input
                id="field-previousSerial"
                maxLength={60}
                value={draft.previousSerial}
                onChange={(e) => {
                  const value = e.target.value;
                  change((d) => {
                    d.previousSerial = value;
                  });
                }}
                className={`${inputClass} min-h-12`}
              />
              {errors.previousSerial ? (
                <p role="alert" className="mt-1 text-sm font-semibold text-fail-700">
                  {errors.previousSerial}
                </p>
              ) : null}
            </div>
          ) : null}
        </div>

        <div className="mt-4 space-y-4">
          <div>
            <p className="text-sm font-semibold" id="field-orientation-label">
              Installed in the approved orientation
            </p>
            <div className="mt-1">
              <YesNo
                id="field-orientationApproved"
                label="Installed in the approved orientation"
                value={draft.orientationApproved}
                yes="As approved"
                no="Not as approved"
                onChange={(value) =>
                  change((d) => {
                    d.orientationApproved = value;
                  })
                }
              />
            </div>
          </div>
          {isRp ? (
            <div>
              <p className="text-sm font-semibold">Air gap below the relief valve port</p>
              <div className="mt-1">
                <YesNo
                  id="field-reliefPortAirGapOk"
                  label="Air gap below the relief valve port"
                  value={draft.reliefPortAirGapOk}
                  yes="Air gap present"
                  no="No proper gap"
                  onChange={(value) =>
                    change((d) => {
                      d.reliefPortAirGapOk = value;
                    })
                  }
                />
              </div>
            </div>
          ) : null}
          {!isAirGap ? (
            <div>
              <label htmlFor="field-linePressure" className="block text-sm font-semibold">
                Line pressure ({program.units === "kPa" ? "kPa" : "psi"}) <span className="text-fail-600">*</span>
              </label>
              <input
                id="field-linePressure"
                type="text"
                inputMode="decimal"
                autoComplete="off"
                value={draft.linePressure}
                aria-invalid={Boolean(errors.linePressure) || undefined}
                onChange={(e) => {
                  const value = e.target.value.slice(0, 10);
                  change((d) => {
                    d.linePressure = value;
                  });
                }}
                className="h-14 w-36 rounded-md border-2 border-ink-200 px-3 text-right text-2xl font-semibold tabular-nums focus:border-estuary-600 focus:outline-2 focus:outline-estuary-600 aria-[invalid=true]:border-fail-600"
              />
              {errors.linePressure ? (
                <p role="alert" className="mt-1 text-sm font-semibold text-fail-700">
                  {errors.linePressure}
                </p>
              ) : parseLinePressure(draft.linePressure, program.units).state === "ok" ? null : (
                <p className="mt-1 text-sm text-ink-600">Static supply pressure at the assembly.</p>
              )}
            </div>
          ) : null}
        </div>
      </section>

      <PhaseReadings
        phaseKey="initial"
        title="Initial test"
        kind={assembly.kind}
        unit={draft.unit}
        ruleSet={program.ruleSet}
        phase={draft.initial}
        grade={evaluation.initial}
        errors={errors}
        onChange={(mutate) => change((d) => mutate(d.initial))}
      />

      {evaluation.needsRepairChoice ? (
        <section id="repairs" aria-labelledby="repairs-title" className="space-y-4 rounded-lg border-2 border-fail-600/40 bg-white px-4 py-4 shadow-sm sm:px-5">
          <h2 id="repairs-title" className="text-lg font-semibold text-fail-700">
            The initial test failed: repairs
          </h2>
          <SafetyCautions />
          <fieldset id="field-repairChoice">
            <legend className="text-base font-semibold">
              Was the assembly repaired on the spot? <span className="text-fail-600">*</span>
            </legend>
            <div className="mt-2 grid gap-2 sm:grid-cols-2">
              {(
                [
                  ["repaired", "Yes: record the repair and retest"],
                  ["not_repaired", "No: file it as failed"],
                ] as const
              ).map(([choice, text]) => (
                <button
                  key={choice}
                  type="button"
                  role="radio"
                  aria-checked={draft.repairChoice === choice}
                  onClick={() =>
                    change((d) => {
                      d.repairChoice = choice;
                    })
                  }
                  className={`min-h-12 rounded-md border-2 px-3 py-2 text-left font-semibold ${draft.repairChoice === choice ? "border-estuary-700 bg-estuary-50 text-estuary-900" : "border-ink-200 bg-white text-ink-800"}`}
                >
                  {text}
                </button>
              ))}
            </div>
            {errors.repairChoice ? (
              <p role="alert" className="mt-1 text-sm font-semibold text-fail-700">
                {errors.repairChoice}
              </p>
            ) : null}
          </fieldset>
          {draft.repairChoice === "not_repaired" ? (
            <Alert tone="warning">
              The report is filed as failed. The program&apos;s repair deadline starts: {program.repairDays} days for a {hazardLabels[assembly.hazard].toLowerCase()}, so repair and retest by {repairDueOn}.
            </Alert>
          ) : null}
          {draft.repairChoice === "repaired" ? (
            <RepairsEditor
              kind={assembly.kind}
              repairs={draft.repairs}
              errors={errors}
              onChange={(mutate: (list: ComponentRepairDraft[]) => void) => change((d) => mutate(d.repairs))}
            />
          ) : null}
        </section>
      ) : null}

      {evaluation.isRetestShown && evaluation.retest ? (
        <PhaseReadings
          phaseKey="retest"
          title="Retest after repair"
          kind={assembly.kind}
          unit={draft.unit}
          ruleSet={program.ruleSet}
          phase={draft.retest}
          grade={evaluation.retest}
          errors={errors}
          onChange={(mutate) => change((d) => mutate(d.retest))}
        />
      ) : null}

      <section aria-labelledby="remarks-title" className="rounded-lg border border-ink-200 bg-white px-4 py-4 shadow-sm sm:px-5">
        <h2 id="remarks-title" className="text-lg font-semibold">
          <label htmlFor="field-remarks">Remarks</label>
        </h2>
        <textarea
          id="field-remarks"
          rows={3}
          maxLength={2000}
          value={draft.remarks}
          placeholder="Anything the program should know (access, owner told of a failure, …)"
          onChange={(e) => {
            const value = e.target.value;
            change((d) => {
              d.remarks = value;
            });
          }}
          className={`${inputClass} mt-2`}
        />
      </section>

      <section aria-labelledby="attest-title" className="space-y-3 rounded-lg border border-ink-200 bg-white px-4 py-4 shadow-sm sm:px-5">
        <h2 id="attest-title" className="text-lg font-semibold">
          Sign and submit
        </h2>
        <p className="text-sm text-ink-800">
          I attest that I performed this test myself with the kit named above and that the readings recorded here are true. The program&apos;s inspector reviews every report; the grade is a check against published minimums, and local codes, the maker&apos;s
          instructions and licensed practice govern.
        </p>
        <div>
          <label htmlFor="field-attestationName" className="block text-sm font-semibold">
            Your name <span className="text-fail-600">*</span>
          </label>
          <input
            id="field-attestationName"
            autoComplete="name"
            value={draft.attestationName}
            placeholder={tester.name}
            aria-invalid={Boolean(errors.attestationName) || undefined}
            onChange={(e) => {
              const value = e.target.value;
              change((d) => {
                d.attestationName = value;
              });
            }}
            className={`${inputClass} min-h-12 text-lg`}
          />
          {errors.attestationName ? (
            <p role="alert" className="mt-1 text-sm font-semibold text-fail-700">
              {errors.attestationName}
            </p>
          ) : null}
        </div>
        <label id="field-attestationConfirmed" className="flex min-h-12 cursor-pointer items-center gap-3 rounded-md border-2 border-ink-200 px-3 py-2 font-semibold">
          <input
            type="checkbox"
            className="h-6 w-6 shrink-0 accent-estuary-700"
            checked={draft.attestationConfirmed}
            onChange={(e) => {
              const checked = e.target.checked;
              change((d) => {
                d.attestationConfirmed = checked;
              });
            }}
          />
          The readings are true and were taken by me.
        </label>
        {errors.attestationConfirmed ? (
          <p role="alert" className="text-sm font-semibold text-fail-700">
            {errors.attestationConfirmed}
          </p>
        ) : null}

        {submitMessage ? (
          <Alert tone={submitMessage.tone} live>
            {submitMessage.text}
          </Alert>
        ) : null}
        {showAllErrors && problemList.length ? (
          <div ref={problemsRef} tabIndex={-1} className="rounded-md border border-fail-600/30 bg-fail-50 px-4 py-3 text-sm text-fail-700" aria-labelledby="problems-title">
            <p id="problems-title" className="font-semibold">
              Still to do before submitting ({problemList.length})
            </p>
            <ul className="mt-1 list-disc space-y-0.5 pl-5">
              {problemList.map(([key, message]) => (
                <li key={key}>
                  <a href={anchorFor(key)} className="text-fail-700 underline">
                    <span className="font-semibold">{labelFor(key)}:</span> {message}
                  </a>
                </li>
              ))}
            </ul>
          </div>
        ) : null}
        {program.filingFeeCents > 0 ? (
          <p className="text-sm text-ink-600">
            {program.shortName} charges a filing fee of {(program.filingFeeCents / 100).toFixed(2)} {program.currency} per report; it is owed once the report is filed.
          </p>
        ) : null}
        <div className="flex flex-wrap items-center gap-3">
          <Button size="lg" className="min-w-48 flex-1 sm:flex-none" onClick={() => void submit()} disabled={isSubmitting} data-testid="submit-report">
            {isSubmitting ? "Submitting…" : basis?.kind === "correction" ? "Submit the correction" : "Submit the report"}
          </Button>
          <Button variant="secondary" size="lg" onClick={() => setConfirming("discard")}>
            Discard this test
          </Button>
        </div>
      </section>

      {confirming ? (
        <div role="alertdialog" aria-labelledby="discard-title" aria-describedby="discard-text" className="fixed inset-x-0 bottom-0 z-20 border-t-2 border-fail-600 bg-white px-4 py-4 shadow-2xl sm:inset-x-auto sm:bottom-6 sm:right-6 sm:max-w-md sm:rounded-lg sm:border-2">
          <p id="discard-title" className="text-lg font-bold text-fail-700">
            {confirming === "start_over" ? "Start this test over?" : "Discard this test?"}
          </p>
          <p id="discard-text" className="mt-1 text-sm text-ink-800">
            Everything typed for it is removed from this phone and from the server. This cannot be undone.
          </p>
          <div className="mt-3 flex gap-2">
            <Button size="lg" variant="secondary" className="flex-1" onClick={() => setConfirming(null)} autoFocus>
              Keep it
            </Button>
            <Button
              size="lg"
              variant="danger"
              className="flex-1"
              onClick={() => {
                const action = confirming;
                setConfirming(null);
                if (action === "start_over") void sync.discard().then(onStartOver);
                else void sync.discard().then(() => window.location.assign("/tester"));
              }}
            >
              {confirming === "start_over" ? "Start over" : "Discard"}
            </Button>
          </div>
        </div>
      ) : null}
    </div>
  );
}

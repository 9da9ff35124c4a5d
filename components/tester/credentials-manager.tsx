"use client";

import { useState } from "react";
import useSWR from "swr";
import { Alert } from "@/components/ui/alert";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { SelectField, TextField } from "@/components/ui/field";
import type { KitDto, MyCredentials } from "@/lib/data/tester-credentials";
import { describeCertification, describeKit } from "@/lib/forms/credential-warnings";
import { DocumentDropzone, type UploadedDocument } from "./document-dropzone";

type FieldErrors = Record<string, string[]>;

async function fetchCredentials(url: string): Promise<MyCredentials> {
  const response = await fetch(url);
  if (!response.ok) throw new Error("Your credentials could not be loaded; reload the page.");
  return (await response.json()) as MyCredentials;
}

async function send(url: string, method: "POST" | "PATCH", body?: unknown): Promise<{ ok: boolean; error?: string; fieldErrors?: FieldErrors }> {
  try {
    const response = await fetch(url, { method, headers: { "content-type": "application/json" }, body: body === undefined ? undefined : JSON.stringify(body) });
    if (response.ok) return { ok: true };
    const json = (await response.json().catch(() => null)) as { error?: string; fieldErrors?: FieldErrors } | null;
    return { ok: false, error: json?.error ?? "That did not work; try again.", fieldErrors: json?.fieldErrors };
  } catch {
    return { ok: false, error: "No signal: nothing was saved. Try again when you are back online." };
  }
}

function CertificationForm({ maxBytes, onDone }: { maxBytes: number; onDone: () => void }) {
  const [values, setValues] = useState({ certifyingBody: "", number: "", issuedOn: "", expiresOn: "" });
  const [document, setDocument] = useState<UploadedDocument | null>(null);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [message, setMessage] = useState<string | null>(null);
  const [isSaving, setSaving] = useState(false);
  const set = (name: keyof typeof values) => (e: { target: { value: string } }) => setValues((v) => ({ ...v, [name]: e.target.value }));
  return (
    <form
      className="space-y-3"
      noValidate
      onSubmit={(e) => {
        e.preventDefault();
        setSaving(true);
        void send("/api/tester/certifications", "POST", { ...values, issuedOn: values.issuedOn || null, attachmentId: document?.id ?? null }).then((result) => {
          setSaving(false);
          if (result.ok) return onDone();
          setErrors(result.fieldErrors ?? {});
          setMessage(result.error ?? null);
        });
      }}
    >
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField id="cert-body" label="Certifying body" value={values.certifyingBody} onChange={set("certifyingBody")} error={errors.certifyingBody} required className="min-h-12" />
        <TextField id="cert-number" label="Certificate number" value={values.number} onChange={set("number")} error={errors.number} required className="min-h-12" />
        <TextField id="cert-issued" label="Issued on" type="date" value={values.issuedOn} onChange={set("issuedOn")} error={errors.issuedOn} className="min-h-12" />
        <TextField id="cert-expires" label="Expires on" type="date" value={values.expiresOn} onChange={set("expiresOn")} error={errors.expiresOn} required className="min-h-12" />
      </div>
      <DocumentDropzone id="cert-document" purpose="certification" maxBytes={maxBytes} label="A copy of the certificate" uploaded={document} onUploaded={setDocument} />
      {message ? (
        <Alert tone="danger" live>
          {message}
        </Alert>
      ) : null}
      <Button type="submit" size="lg" disabled={isSaving}>
        {isSaving ? "Saving…" : "Save the certification"}
      </Button>
    </form>
  );
}

function KitForm({ maxBytes, kit, onDone }: { maxBytes: number; kit?: KitDto; onDone: () => void }) {
  const isNewCheck = Boolean(kit);
  const [values, setValues] = useState({ make: "", model: "", serial: "", date: "", result: "passed", verifiedBy: "" });
  const [document, setDocument] = useState<UploadedDocument | null>(null);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [message, setMessage] = useState<string | null>(null);
  const [isSaving, setSaving] = useState(false);
  const set = (name: keyof typeof values) => (e: { target: { value: string } }) => setValues((v) => ({ ...v, [name]: e.target.value }));
  const prefix = kit ? `kit-${kit.id}` : "kit-new";
  return (
    <form
      className="space-y-3"
      noValidate
      onSubmit={(e) => {
        e.preventDefault();
        setSaving(true);
        const request = kit
          ? send(`/api/tester/kits/${kit.id}/verification`, "POST", { verifiedOn: values.date, result: values.result, verifiedBy: values.verifiedBy, attachmentId: document?.id ?? null })
          : send("/api/tester/kits", "POST", { make: values.make, model: values.model, serial: values.serial, lastVerifiedOn: values.date, verificationResult: values.result, verifiedBy: values.verifiedBy, attachmentId: document?.id ?? null });
        void request.then((result) => {
          setSaving(false);
          if (result.ok) return onDone();
          setErrors(result.fieldErrors ?? {});
          setMessage(result.error ?? null);
        });
      }}
    >
      {isNewCheck ? null : (
        <div className="grid gap-3 sm:grid-cols-3">
          <TextField id={`${prefix}-make`} label="Make" value={values.make} onChange={set("make")} error={errors.make} required className="min-h-12" />
          <TextField id={`${prefix}-model`} label="Model" value={values.model} onChange={set("model")} error={errors.model} required className="min-h-12" />
          <TextField id={`${prefix}-serial`} label="Serial number" value={values.serial} onChange={set("serial")} error={errors.serial} required className="min-h-12" />
        </div>
      )}
      <div className="grid gap-3 sm:grid-cols-3">
        <TextField id={`${prefix}-date`} label="Accuracy checked on" type="date" value={values.date} onChange={set("date")} error={errors.verifiedOn ?? errors.lastVerifiedOn} required className="min-h-12" />
        <SelectField id={`${prefix}-result`} label="Result" value={values.result} onChange={set("result")} error={errors.result ?? errors.verificationResult} className="min-h-12">
          <option value="passed">Within tolerance</option>
          <option value="adjusted">Adjusted, then within tolerance</option>
          <option value="failed">Failed</option>
        </SelectField>
        <TextField id={`${prefix}-by`} label="Checked by" hint="The lab or bench" value={values.verifiedBy} onChange={set("verifiedBy")} error={errors.verifiedBy} className="min-h-12" />
      </div>
      <DocumentDropzone id={`${prefix}-document`} purpose="kit_verification" maxBytes={maxBytes} label="The accuracy check record" uploaded={document} onUploaded={setDocument} />
      {message ? (
        <Alert tone="danger" live>
          {message}
        </Alert>
      ) : null}
      <Button type="submit" size="lg" disabled={isSaving}>
        {isSaving ? "Saving…" : isNewCheck ? "Record the accuracy check" : "Add the kit"}
      </Button>
    </form>
  );
}

/** Certification and test kits, with their documents: what lets a tester file reports. */
export function CredentialsManager({ initial }: { initial: MyCredentials }) {
  const { data, mutate } = useSWR<MyCredentials>("/api/tester/credentials", fetchCredentials, { fallbackData: initial, revalidateOnMount: false });
  const credentials = data ?? initial;
  const [open, setOpen] = useState<string | null>(null);
  const [notice, setNotice] = useState<{ tone: "success" | "danger"; text: string } | null>(null);
  const [confirmRetire, setConfirmRetire] = useState<number | null>(null);
  const done = (text: string) => {
    setOpen(null);
    setNotice({ tone: "success", text });
    void mutate();
  };
  const current = credentials.certifications.find((c) => c.isCurrent) ?? null;
  const older = credentials.certifications.filter((c) => !c.isCurrent);
  const activeKits = credentials.kits.filter((k) => !k.retiredAt);
  const retiredKits = credentials.kits.filter((k) => k.retiredAt);

  return (
    <div className="space-y-6">
      {notice ? (
        <Alert tone={notice.tone} live>
          {notice.text}
        </Alert>
      ) : null}
      {credentials.warnings.map((w) => (
        <Alert key={w.message} tone={w.tone === "danger" ? "danger" : "warning"}>
          {w.message}
        </Alert>
      ))}

      <Card title="Certification" actions={open === "cert" ? null : <Button variant="secondary" onClick={() => setOpen("cert")}>{current ? "Add the renewed one" : "Add your certification"}</Button>}>
        {current ? (
          <div className="space-y-2" data-testid="current-certification">
            <div className="flex flex-wrap items-center justify-between gap-2">
              <p className="text-lg font-bold">{current.number}</p>
              <Badge tone={describeCertification(current, credentials.today).tone}>{describeCertification(current, credentials.today).text}</Badge>
            </div>
            <p className="text-sm text-ink-600">
              {current.certifyingBody}
              {current.issuedOn ? ` · issued ${current.issuedOn}` : ""}
            </p>
            {current.document ? (
              <p className="text-sm">
                Document: <a href={`/api/files/${current.document.id}`} target="_blank" rel="noopener">{current.document.name}</a>
              </p>
            ) : (
              <div className="max-w-md">
                <DocumentDropzone
                  id="cert-attach"
                  purpose="certification"
                  maxBytes={credentials.uploadLimitBytes}
                  label="Upload a copy of this certificate"
                  uploaded={null}
                  onUploaded={(doc) => {
                    if (!doc) return;
                    void send(`/api/tester/certifications/${current.id}`, "PATCH", { attachmentId: doc.id }).then((r) => (r.ok ? done("The certificate's copy is on file.") : setNotice({ tone: "danger", text: r.error ?? "Not saved." })));
                  }}
                />
              </div>
            )}
          </div>
        ) : (
          <p className="text-ink-600">No certification on file.</p>
        )}
        {open === "cert" ? (
          <div className="mt-4 border-t border-ink-100 pt-4">
            <CertificationForm maxBytes={credentials.uploadLimitBytes} onDone={() => done("The certification is saved.")} />
            <Button variant="ghost" className="mt-2" onClick={() => setOpen(null)}>
              Cancel
            </Button>
          </div>
        ) : null}
        {older.length ? (
          <details className="mt-4 text-sm">
            <summary className="cursor-pointer font-semibold">Earlier certifications ({older.length})</summary>
            <ul className="mt-2 space-y-1">
              {older.map((c) => (
                <li key={c.id}>
                  {c.number} · {c.certifyingBody} · expired {c.expiresOn}
                </li>
              ))}
            </ul>
          </details>
        ) : null}
      </Card>

      <Card title="Test kits" actions={open === "kit" ? null : <Button variant="secondary" onClick={() => setOpen("kit")}>Add a kit</Button>}>
        <p className="mb-3 text-sm text-ink-600">Each differential gauge must have had its accuracy checked within the last {credentials.verificationMaxMonths} months on the day of a test.</p>
        {open === "kit" ? (
          <div className="mb-4 rounded-md border border-ink-200 px-3 py-3">
            <KitForm maxBytes={credentials.uploadLimitBytes} onDone={() => done("The kit is added.")} />
            <Button variant="ghost" className="mt-2" onClick={() => setOpen(null)}>
              Cancel
            </Button>
          </div>
        ) : null}
        <ul className="space-y-3">
          {activeKits.map((kit) => {
            const tone = describeKit(kit, credentials.today);
            return (
              <li key={kit.id} className="rounded-md border border-ink-200 px-3 py-3" data-kit={kit.id}>
                <div className="flex flex-wrap items-start justify-between gap-2">
                  <div>
                    <p className="font-bold">
                      {kit.make} {kit.model}
                    </p>
                    <p className="text-sm text-ink-600">
                      Serial {kit.serial} · checked {kit.lastVerifiedOn}
                      {kit.verifiedBy ? ` by ${kit.verifiedBy}` : ""}
                    </p>
                    {kit.document ? (
                      <p className="text-sm">
                        Record: <a href={`/api/files/${kit.document.id}`} target="_blank" rel="noopener">{kit.document.name}</a>
                      </p>
                    ) : (
                      <p className="text-sm text-caution-700">No accuracy record uploaded.</p>
                    )}
                  </div>
                  <Badge tone={tone.tone}>{tone.text}</Badge>
                </div>
                <div className="mt-2 flex flex-wrap gap-2">
                  <Button variant="secondary" onClick={() => setOpen(open === `check-${kit.id}` ? null : `check-${kit.id}`)}>
                    Record a new accuracy check
                  </Button>
                  {confirmRetire === kit.id ? (
                    <>
                      <Button
                        variant="danger"
                        onClick={() => {
                          setConfirmRetire(null);
                          void send(`/api/tester/kits/${kit.id}/retire`, "POST").then((r) => (r.ok ? done(`Kit ${kit.serial} is retired.`) : setNotice({ tone: "danger", text: r.error ?? "Not saved." })));
                        }}
                      >
                        Yes, retire it
                      </Button>
                      <Button variant="ghost" onClick={() => setConfirmRetire(null)}>
                        Keep it
                      </Button>
                    </>
                  ) : (
                    <Button variant="ghost" onClick={() => setConfirmRetire(kit.id)}>
                      Retire
                    </Button>
                  )}
                </div>
                {open === `check-${kit.id}` ? (
                  <div className="mt-3 border-t border-ink-100 pt-3">
                    <KitForm maxBytes={credentials.uploadLimitBytes} kit={kit} onDone={() => done(`The new accuracy check of ${kit.serial} is recorded.`)} />
                  </div>
                ) : null}
              </li>
            );
          })}
        </ul>
        {activeKits.length === 0 ? <p className="text-ink-600">No kit in service.</p> : null}
        {retiredKits.length ? (
          <details className="mt-4 text-sm">
            <summary className="cursor-pointer font-semibold">Retired kits ({retiredKits.length})</summary>
            <ul className="mt-2 space-y-1">
              {retiredKits.map((k) => (
                <li key={k.id}>
                  {k.make} {k.model} · {k.serial} · retired {k.retiredAt?.slice(0, 10)} (add it again with the same serial to return it to service)
                </li>
              ))}
            </ul>
          </details>
        ) : null}
      </Card>
    </div>
  );
}

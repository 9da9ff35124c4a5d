"use client";

import { useEffect, useState } from "react";
import useSWR from "swr";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { TextAreaField, TextField } from "@/components/ui/field";
import type { SiteSearchHit } from "@/lib/data/assemblies-search";
import { assemblyKindLabels, assemblyKinds, type AssemblyKind } from "@/lib/rules";
import { ProgramPicker, useChosenProgram, type ProgramChoice } from "./program-picker";

async function fetchJson<T>(url: string): Promise<T> {
  const response = await fetch(url);
  const body = (await response.json().catch(() => null)) as (T & { error?: string }) | null;
  if (!response.ok) throw new Error(body?.error ?? "The search did not answer; try again.");
  return body as T;
}

/** A newly installed assembly, registered from the field; the inspector confirms it later. */
export function RegisterAssemblyForm({ programs, preferredProgram, today }: { programs: ProgramChoice[]; preferredProgram?: number; today: string }) {
  const [chosen, choose] = useChosenProgram(programs, preferredProgram);
  const [siteQuery, setSiteQuery] = useState("");
  const [debounced, setDebounced] = useState("");
  const [site, setSite] = useState<SiteSearchHit | null>(null);
  const [kind, setKind] = useState<AssemblyKind | null>(null);
  const [fields, setFields] = useState({ make: "", model: "", size: "", serial: "", location: "", installedOn: today, notes: "" });
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [message, setMessage] = useState<string | null>(null);
  const [isSaving, setSaving] = useState(false);
  useEffect(() => {
    const id = setTimeout(() => setDebounced(siteQuery.trim()), 250);
    return () => clearTimeout(id);
  }, [siteQuery]);
  const key = chosen && !site && debounced.length >= 2 ? `/api/assemblies/sites?program=${chosen.id}&q=${encodeURIComponent(debounced)}` : null;
  const { data } = useSWR<{ hits: SiteSearchHit[] }>(key, fetchJson, { keepPreviousData: true });
  const set = (name: keyof typeof fields) => (event: { target: { value: string } }) => setFields((f) => ({ ...f, [name]: event.target.value }));

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    setMessage(null);
    if (!chosen) return setMessage("Pick the program first.");
    setSaving(true);
    try {
      const response = await fetch("/api/assemblies", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ programId: chosen.id, siteId: site?.id ?? null, kind, ...fields, installedOn: fields.installedOn || null }),
      });
      const body = (await response.json().catch(() => null)) as { id?: number; error?: string; fieldErrors?: Record<string, string[]> } | null;
      if (response.status === 201 && body?.id) {
        window.location.assign(`/tester/reports/new?assembly=${body.id}`);
        return;
      }
      setErrors(body?.fieldErrors ?? {});
      setMessage(body?.fieldErrors && Object.keys(body.fieldErrors).length ? "Please check the highlighted fields." : (body?.error ?? "The assembly was not registered; try again."));
    } catch {
      setMessage("No signal: the assembly was not registered. Try again when you are back online.");
    }
    setSaving(false);
  }

  return (
    <form onSubmit={(e) => void submit(e)} className="space-y-5" noValidate>
      <ProgramPicker programs={programs} chosen={chosen} onChoose={(id) => { choose(id); setSite(null); }} />
      <section className="space-y-2 rounded-lg border border-ink-200 bg-white px-4 py-4 shadow-sm">
        <h2 className="text-lg font-semibold">1. The site</h2>
        {site ? (
          <div className="flex flex-wrap items-center justify-between gap-2 rounded-md bg-estuary-50 px-3 py-2">
            <span>
              <span className="block font-semibold">
                {site.addressLine1}, {site.city}
              </span>
              <span className="block text-sm text-ink-600">
                {site.name} · account {site.accountNumber}
              </span>
            </span>
            <Button variant="secondary" onClick={() => setSite(null)}>
              Change
            </Button>
          </div>
        ) : (
          <>
            <TextField id="siteId" label="Account number or street address" hint="The service the assembly protects. Type the start of it." value={siteQuery} onChange={(e) => setSiteQuery(e.target.value)} disabled={!chosen} placeholder={chosen ? "e.g. QV1000 or 873 Amber" : "Pick the program first"} error={errors.siteId} autoComplete="off" className="min-h-12 text-lg" />
            <ul className="space-y-2">
              {(key ? (data?.hits ?? []) : []).map((hit) => (
                <li key={hit.id}>
                  <button type="button" onClick={() => setSite(hit)} className="block min-h-12 w-full rounded-md border-2 border-ink-200 bg-white px-3 py-2 text-left hover:border-estuary-400">
                    <span className="block font-semibold">
                      {hit.addressLine1}, {hit.city}
                    </span>
                    <span className="block text-sm text-ink-600">
                      {hit.name} · account {hit.accountNumber}
                    </span>
                  </button>
                </li>
              ))}
            </ul>
            {key && data && data.hits.length === 0 ? <p className="text-sm text-ink-600">No site matches. A site that is not in the inventory yet is added by the program office: call them with the account number.</p> : null}
          </>
        )}
      </section>

      <section className="space-y-3 rounded-lg border border-ink-200 bg-white px-4 py-4 shadow-sm">
        <h2 className="text-lg font-semibold">2. The assembly</h2>
        <fieldset id="kind">
          <legend className="text-sm font-semibold">
            Kind <span className="text-fail-600">*</span>
          </legend>
          <div className="mt-1 grid grid-cols-2 gap-2 sm:grid-cols-4">
            {assemblyKinds.map((k) => (
              <button key={k} type="button" role="radio" aria-checked={kind === k} title={assemblyKindLabels[k]} onClick={() => setKind(k)} className={`min-h-12 rounded-md border-2 px-2 py-2 font-bold ${kind === k ? "border-estuary-700 bg-estuary-50 text-estuary-900" : "border-ink-200 bg-white"}`}>
                {k}
              </button>
            ))}
          </div>
          {kind ? <p className="mt-1 text-sm text-ink-600">{assemblyKindLabels[kind]}</p> : null}
          {errors.kind ? (
            <p role="alert" className="mt-1 text-sm font-medium text-fail-700">
              {errors.kind[0]}
            </p>
          ) : null}
        </fieldset>
        <div className="grid gap-3 sm:grid-cols-2">
          <TextField id="make" label="Make" value={fields.make} onChange={set("make")} error={errors.make} required={kind !== "AG"} maxLength={80} className="min-h-12" />
          <TextField id="model" label="Model" value={fields.model} onChange={set("model")} error={errors.model} maxLength={80} className="min-h-12" />
          <TextField id="size" label="Size" hint="e.g. 3/4 in" value={fields.size} onChange={set("size")} error={errors.size} required={kind !== "AG"} maxLength={20} className="min-h-12" />
          <TextField id="serial" label="Serial number" value={fields.serial} onChange={set("serial")} error={errors.serial} required={kind !== "AG"} maxLength={60} autoCapitalize="characters" className="min-h-12" />
        </div>
        <TextField id="location" label="Where on the site" hint="e.g. meter vault at the street, boiler room" value={fields.location} onChange={set("location")} error={errors.location} required maxLength={200} className="min-h-12" />
        <TextField id="installedOn" label="Installed on" type="date" max={today} value={fields.installedOn} onChange={set("installedOn")} error={errors.installedOn} className="min-h-12" />
        <TextAreaField id="notes" label="Notes for the inspector" rows={2} value={fields.notes} onChange={set("notes")} error={errors.notes} maxLength={500} />
      </section>
      {message ? (
        <Alert tone="danger" live>
          {message}
        </Alert>
      ) : null}
      <Button type="submit" size="lg" className="w-full sm:w-auto" disabled={isSaving}>
        {isSaving ? "Registering…" : "Register and start the test"}
      </Button>
      <p className="text-sm text-ink-600">The assembly is marked “awaiting confirmation” until the program checks it; its first report can be filed at once.</p>
    </form>
  );
}

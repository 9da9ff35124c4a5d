"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { inputClass, SelectField, TextAreaField, TextField } from "@/components/ui/field";
import { checkedOf, JsonForm, textOf } from "./json-form";
import { sendJson } from "./send-json";

const hazards = [
  ["low", "Low hazard"],
  ["high", "High health hazard"],
  ["severe", "Severe health hazard"],
] as const;
const kinds = [
  ["RP", "RP — reduced pressure principle assembly"],
  ["RPDA", "RPDA — reduced pressure detector assembly"],
  ["DC", "DC — double check valve assembly"],
  ["DCDA", "DCDA — double check detector assembly"],
  ["PVB", "PVB — pressure vacuum breaker"],
  ["SVB", "SVB — spill-resistant vacuum breaker"],
  ["AG", "AG — air gap"],
] as const;

function Checkbox({ name, label, defaultChecked, hint }: { name: string; label: string; defaultChecked?: boolean; hint?: string }) {
  return (
    <label className="flex items-start gap-2 text-sm">
      <input type="checkbox" name={name} defaultChecked={defaultChecked} className="mt-0.5 h-4 w-4" />
      <span>
        <span className="font-semibold text-ink-800">{label}</span>
        {hint ? <span className="block text-ink-600">{hint}</span> : null}
      </span>
    </label>
  );
}

export interface SiteFormValues {
  accountNumber: string;
  name: string;
  addressLine1: string;
  addressLine2: string;
  city: string;
  postalCode: string;
  hazard: string;
  facilityType: string;
  contactName: string;
  contactPhone: string;
  notes: string;
  isActive: boolean;
}

const siteBody = (d: FormData) => ({
  accountNumber: textOf(d, "accountNumber"),
  name: textOf(d, "name"),
  addressLine1: textOf(d, "addressLine1"),
  addressLine2: textOf(d, "addressLine2"),
  city: textOf(d, "city"),
  postalCode: textOf(d, "postalCode"),
  hazard: textOf(d, "hazard"),
  facilityType: textOf(d, "facilityType"),
  contactName: textOf(d, "contactName"),
  contactPhone: textOf(d, "contactPhone"),
  notes: textOf(d, "notes"),
  isActive: d.has("isActiveField") ? checkedOf(d, "isActive") : true,
  applyHazardToAssemblies: checkedOf(d, "applyHazardToAssemblies"),
});

export function SiteForm({ siteId, values, facilityTypes }: { siteId?: number; values?: SiteFormValues; facilityTypes: string[] }) {
  const router = useRouter();
  const v = values ?? { accountNumber: "", name: "", addressLine1: "", addressLine2: "", city: "", postalCode: "", hazard: "low", facilityType: "", contactName: "", contactPhone: "", notes: "", isActive: true };
  return (
    <JsonForm<{ id?: number; assembliesUpdated?: number }>
      method={siteId ? "PATCH" : "POST"}
      url={siteId ? `/api/inspector/sites/${siteId}` : "/api/inspector/sites"}
      toBody={siteBody}
      submitLabel={siteId ? "Save the site" : "Add the site"}
      successMessage={(data) => (siteId ? `Saved.${data.assembliesUpdated ? ` ${data.assembliesUpdated} assemblies were given the new hazard and their deadlines recomputed.` : ""}` : "Site added.")}
      onSuccess={(data) => {
        if (!siteId && data.id) router.push(`/inspector/sites/${data.id}`);
      }}
    >
      {(errors) => (
        <>
          <div className="grid gap-4 sm:grid-cols-2">
            <TextField id="accountNumber" label="Account number" required defaultValue={v.accountNumber} error={errors.accountNumber} maxLength={40} />
            <TextField id="name" label="Site name" required defaultValue={v.name} error={errors.name} maxLength={160} />
            <TextField id="addressLine1" label="Service address" required defaultValue={v.addressLine1} error={errors.addressLine1} maxLength={200} />
            <TextField id="addressLine2" label="Address line 2" defaultValue={v.addressLine2} error={errors.addressLine2} maxLength={200} />
            <TextField id="city" label="Town or city" required defaultValue={v.city} error={errors.city} maxLength={100} />
            <TextField id="postalCode" label="Postal code" defaultValue={v.postalCode} error={errors.postalCode} maxLength={20} />
            <SelectField id="hazard" label="Degree of hazard of the premises" defaultValue={v.hazard} error={errors.hazard} hint="Decides which kinds of assembly protect the service (Washington WAC 246-290-490(4)(b)).">
              {hazards.map(([value, label]) => (
                <option key={value} value={value}>
                  {label}
                </option>
              ))}
            </SelectField>
            <TextField id="facilityType" label="Facility type" list="facility-types" defaultValue={v.facilityType} error={errors.facilityType} maxLength={60} />
            <datalist id="facility-types">
              {facilityTypes.map((t) => (
                <option key={t} value={t} />
              ))}
            </datalist>
            <TextField id="contactName" label="Site contact" defaultValue={v.contactName} error={errors.contactName} maxLength={120} />
            <TextField id="contactPhone" label="Site contact phone" defaultValue={v.contactPhone} error={errors.contactPhone} maxLength={40} />
          </div>
          <TextAreaField id="notes" label="Notes" rows={2} defaultValue={v.notes} error={errors.notes} maxLength={2000} />
          {siteId ? (
            <div className="space-y-2">
              <input type="hidden" name="isActiveField" value="1" />
              <Checkbox name="isActive" label="Site is active (water service connected)" defaultChecked={v.isActive} />
              <Checkbox name="applyHazardToAssemblies" label="When the hazard changes, give the site's assemblies the same hazard" hint="Their repair deadlines follow the hazard and are recomputed." defaultChecked />
            </div>
          ) : null}
        </>
      )}
    </JsonForm>
  );
}

export interface AssemblyFormValues {
  kind: string;
  make: string;
  model: string;
  size: string;
  serial: string;
  location: string;
  hazard: string;
  backpressurePossible: boolean;
  installedOn: string | null;
  notes: string;
}

const assemblyBody = (d: FormData) => ({
  kind: textOf(d, "kind"),
  make: textOf(d, "make"),
  model: textOf(d, "model"),
  size: textOf(d, "size"),
  serial: textOf(d, "serial"),
  location: textOf(d, "location"),
  hazard: textOf(d, "hazard"),
  backpressurePossible: checkedOf(d, "backpressurePossible"),
  installedOn: textOf(d, "installedOn"),
  notes: textOf(d, "notes"),
});

function AssemblyFields({ v, errors, prefix = "" }: { v: AssemblyFormValues; errors: Record<string, string[]>; prefix?: string }) {
  const id = (name: string) => `${prefix}${name}`;
  const err = (name: string) => errors[`${prefix ? "replacement." : ""}${name}`] ?? errors[name];
  return (
    <>
      <div className="grid gap-4 sm:grid-cols-2">
        <SelectField id={id("kind")} label="Kind" required defaultValue={v.kind} error={err("kind")}>
          {kinds.map(([value, label]) => (
            <option key={value} value={value}>
              {label}
            </option>
          ))}
        </SelectField>
        <SelectField id={id("hazard")} label="Degree of hazard" defaultValue={v.hazard} error={err("hazard")}>
          {hazards.map(([value, label]) => (
            <option key={value} value={value}>
              {label}
            </option>
          ))}
        </SelectField>
        <TextField id={id("make")} label="Make" defaultValue={v.make} error={err("make")} maxLength={80} />
        <TextField id={id("model")} label="Model" defaultValue={v.model} error={err("model")} maxLength={80} />
        <TextField id={id("serial")} label="Serial" defaultValue={v.serial} error={err("serial")} maxLength={60} />
        <TextField id={id("size")} label="Size" placeholder="e.g. 3/4 in" defaultValue={v.size} error={err("size")} maxLength={20} />
        <TextField id={id("location")} label="Location on the site" defaultValue={v.location} error={err("location")} maxLength={200} />
        <TextField id={id("installedOn")} label="Installed on" type="date" defaultValue={v.installedOn ?? ""} error={err("installedOn")} />
      </div>
      <Checkbox name={id("backpressurePossible")} label="Backpressure is possible downstream" hint="A PVB or SVB must never be used where it is (Texas 30 TAC §344.50(b)(3)–(4))." defaultChecked={v.backpressurePossible} />
      <TextAreaField id={id("notes")} label="Notes" rows={2} defaultValue={v.notes} error={err("notes")} maxLength={2000} />
    </>
  );
}

const emptyAssembly: AssemblyFormValues = { kind: "RP", make: "", model: "", size: "", serial: "", location: "", hazard: "low", backpressurePossible: false, installedOn: null, notes: "" };

/** Add an assembly to a site, edit one, or confirm a field registration (with corrections). */
export function AssemblyForm({ mode, siteId, assemblyId, values }: { mode: "create" | "edit" | "confirm"; siteId?: number; assemblyId?: number; values?: AssemblyFormValues }) {
  const router = useRouter();
  const url = mode === "create" ? `/api/inspector/sites/${siteId}/assemblies` : mode === "confirm" ? `/api/inspector/assemblies/${assemblyId}/confirm` : `/api/inspector/assemblies/${assemblyId}`;
  return (
    <JsonForm<{ id?: number }>
      method={mode === "edit" ? "PATCH" : "POST"}
      url={url}
      toBody={assemblyBody}
      submitLabel={mode === "create" ? "Add the assembly" : mode === "confirm" ? "Confirm the assembly" : "Save the assembly"}
      successMessage={mode === "create" ? "Assembly added." : mode === "confirm" ? "Confirmed: the assembly is in service and counts from now on." : "Saved; its due dates were recomputed."}
      onSuccess={(data) => {
        if (mode === "create" && data.id) router.push(`/inspector/assemblies/${data.id}`);
      }}
    >
      {(errors) => <AssemblyFields v={values ?? emptyAssembly} errors={errors} />}
    </JsonForm>
  );
}

/** Take an assembly out of service (removed, or replaced by a new one), or put it back. */
export function AssemblyStatusForm({ assemblyId, status, today, hazard }: { assemblyId: number; status: string; today: string; hazard: string }) {
  const [action, setAction] = useState<"remove" | "replace">("remove");
  if (status === "removed" || status === "replaced") {
    return (
      <JsonForm method="POST" url={`/api/inspector/assemblies/${assemblyId}/status`} toBody={(d) => ({ action: "reinstate", note: textOf(d, "note") })} submitLabel="Put back in service" submitVariant="secondary" successMessage="Back in service; its due dates were recomputed.">
        {(errors) => <TextField id="note" label="Why (kept in the notes and the audit log)" error={errors.note} maxLength={500} />}
      </JsonForm>
    );
  }
  return (
    <div className="space-y-3">
      <fieldset className="flex flex-wrap gap-4 text-sm">
        <legend className="sr-only">What happened</legend>
        <label className="flex items-center gap-2">
          <input type="radio" name="status-action" checked={action === "remove"} onChange={() => setAction("remove")} /> Removed
        </label>
        <label className="flex items-center gap-2">
          <input type="radio" name="status-action" checked={action === "replace"} onChange={() => setAction("replace")} /> Replaced by a new assembly
        </label>
      </fieldset>
      <JsonForm<{ replacementId: number | null }>
        method="POST"
        url={`/api/inspector/assemblies/${assemblyId}/status`}
        toBody={(d) => ({ action, on: textOf(d, "on"), note: textOf(d, "note"), ...(action === "replace" ? { replacement: { ...assemblyBody(new FormDataPrefixed(d, "r-")) } } : {}) })}
        submitLabel={action === "replace" ? "Record the replacement" : "Mark as removed"}
        submitVariant="danger"
        successMessage={(data) => (data.replacementId ? `Recorded. The new assembly is #${data.replacementId}; its test is due at installation.` : "Recorded. Its history stays; it no longer counts as due.")}
      >
        {(errors) => (
          <>
            <div className="grid gap-4 sm:grid-cols-2">
              <TextField id="on" label={action === "replace" ? "Replaced on" : "Removed on"} type="date" required defaultValue={today} max={today} error={errors.on} />
              <TextField id="note" label="Note" error={errors.note} maxLength={500} />
            </div>
            {action === "replace" ? (
              <fieldset className="space-y-4 rounded-md border border-ink-200 p-4">
                <legend className="px-1 text-sm font-semibold">The new assembly</legend>
                <AssemblyFields prefix="r-" v={{ ...emptyAssembly, hazard, installedOn: today }} errors={errors} />
              </fieldset>
            ) : null}
          </>
        )}
      </JsonForm>
    </div>
  );
}

/** A FormData view that reads "r-kind" as "kind" (the replacement's fields in the same form). */
class FormDataPrefixed extends FormData {
  constructor(source: FormData, prefix: string) {
    super();
    for (const [key, value] of source.entries()) if (key.startsWith(prefix)) this.append(key.slice(prefix.length), value);
  }
}

/** Merge a field registration into an assembly already on file. */
export function MergeForm({ assemblyId, candidates }: { assemblyId: number; candidates: { id: number; label: string; siteName: string; isSameSite: boolean }[] }) {
  const router = useRouter();
  const [target, setTarget] = useState<string>(candidates[0] ? String(candidates[0].id) : "");
  const [error, setError] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  return (
    <form
      className="space-y-3"
      onSubmit={(e) => {
        e.preventDefault();
        setError(null);
        void sendJson<{ movedReports: number }>("POST", `/api/inspector/assemblies/${assemblyId}/merge`, { targetId: Number(target) }).then((r) => {
          if (!r.ok) setError(r.fieldErrors.targetId?.[0] ?? r.error);
          else {
            setDone(`Merged: ${r.data.movedReports} report${r.data.movedReports === 1 ? "" : "s"} moved to assembly #${target}.`);
            router.push(`/inspector/assemblies/${target}`);
          }
        });
      }}
    >
      <div className="space-y-1.5">
        <label htmlFor="merge-target" className="block text-sm font-semibold text-ink-800">
          The assembly already on file
        </label>
        <input id="merge-target" className={inputClass} list="merge-candidates" inputMode="numeric" placeholder="Assembly number, e.g. 1234" value={target} onChange={(e) => setTarget(e.target.value.replace(/[^0-9]/g, ""))} />
        <datalist id="merge-candidates">
          {candidates.map((c) => (
            <option key={c.id} value={c.id}>{`#${c.id} ${c.label} — ${c.siteName}${c.isSameSite ? " (same site)" : ""}`}</option>
          ))}
        </datalist>
        {candidates.length ? (
          <ul className="text-sm text-ink-600">
            {candidates.slice(0, 6).map((c) => (
              <li key={c.id}>
                <button type="button" className="text-estuary-700 underline" onClick={() => setTarget(String(c.id))}>
                  #{c.id}
                </button>{" "}
                {c.label} — {c.siteName}
                {c.isSameSite ? " (same site)" : ""}
              </li>
            ))}
          </ul>
        ) : (
          <p className="text-sm text-ink-600">No likely match at this site or with this serial; type the number of the assembly.</p>
        )}
      </div>
      {error ? <Alert tone="danger" live>{error}</Alert> : null}
      {done ? <Alert tone="success" live>{done}</Alert> : null}
      <Button type="submit" variant="secondary" disabled={!target}>
        Merge into #{target || "…"}
      </Button>
    </form>
  );
}

/** Add an owner or manager contact to a site. */
export function AddOwnerForm({ siteId }: { siteId: number }) {
  return (
    <JsonForm
      method="POST"
      url={`/api/inspector/sites/${siteId}/owners`}
      toBody={(d) => ({ name: textOf(d, "ownerName"), email: textOf(d, "ownerEmail"), phone: textOf(d, "ownerPhone"), mailingAddress: textOf(d, "ownerAddress"), relation: textOf(d, "relation"), receivesNotices: checkedOf(d, "receivesNotices") })}
      submitLabel="Add the contact"
      successMessage="Contact added."
    >
      {(errors) => (
        <>
          <div className="grid gap-4 sm:grid-cols-2">
            <TextField id="ownerName" label="Name" required error={errors.name} maxLength={160} />
            <TextField id="ownerEmail" label="E-mail" type="email" hint="Without one, notices go by letter." error={errors.email} maxLength={254} />
            <TextField id="ownerPhone" label="Phone" error={errors.phone} maxLength={40} />
            <TextField id="ownerAddress" label="Mailing address" error={errors.mailingAddress} maxLength={300} />
            <SelectField id="relation" label="Relation" defaultValue="owner">
              <option value="owner">Owner</option>
              <option value="manager">Manager</option>
            </SelectField>
          </div>
          <Checkbox name="receivesNotices" label="Receives the program's notices for this site" defaultChecked />
        </>
      )}
    </JsonForm>
  );
}

/** Controls of one site–owner link: notices on/off, remove from the site, invite to the portal. */
export function OwnerLinkControls({ siteId, ownerId, receivesNotices, canInvite, portal }: { siteId: number; ownerId: number; receivesNotices: boolean; canInvite: boolean; portal: string }) {
  const router = useRouter();
  const [message, setMessage] = useState<string | null>(null);
  const act = async (body: unknown) => {
    const result = await sendJson("PATCH", `/api/inspector/sites/${siteId}/owners/${ownerId}`, body);
    setMessage(result.ok ? null : result.error);
    router.refresh();
  };
  const invite = async () => {
    const result = await sendJson<{ status: string }>("POST", `/api/inspector/owners/${ownerId}/invitation`);
    setMessage(result.ok ? (result.data.status === "linked" ? "Linked to the owner's existing portal account." : "Invitation e-mailed.") : result.error);
    router.refresh();
  };
  return (
    <div className="flex flex-wrap items-center gap-2 text-sm">
      <Button size="sm" variant="secondary" onClick={() => void act({ receivesNotices: !receivesNotices })}>
        {receivesNotices ? "Stop notices" : "Send notices"}
      </Button>
      {canInvite && portal !== "active" ? (
        <Button size="sm" variant="secondary" onClick={() => void invite()}>
          {portal === "invited" ? "Re-send portal invitation" : "Invite to the owner portal"}
        </Button>
      ) : null}
      <Button
        size="sm"
        variant="ghost"
        onClick={() => {
          if (window.confirm("Remove this contact from the site? The owner record stays.")) void act({ remove: true });
        }}
      >
        Remove from site
      </Button>
      {message ? (
        <span role="status" className="text-ink-700">
          {message}
        </span>
      ) : null}
    </div>
  );
}

/** Edit an owner's contact details. */
export function OwnerForm({ ownerId, values }: { ownerId: number; values: { name: string; email: string | null; phone: string; mailingAddress: string } }) {
  return (
    <JsonForm method="PATCH" url={`/api/inspector/owners/${ownerId}`} toBody={(d) => ({ name: textOf(d, "name"), email: textOf(d, "email"), phone: textOf(d, "phone"), mailingAddress: textOf(d, "mailingAddress") })} submitLabel="Save the owner" successMessage="Saved.">
      {(errors) => (
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField id="name" label="Name" required defaultValue={values.name} error={errors.name} maxLength={160} />
          <TextField id="email" label="E-mail" type="email" defaultValue={values.email ?? ""} error={errors.email} maxLength={254} hint="Without one, notices go by letter." />
          <TextField id="phone" label="Phone" defaultValue={values.phone} error={errors.phone} maxLength={40} />
          <TextField id="mailingAddress" label="Mailing address" defaultValue={values.mailingAddress} error={errors.mailingAddress} maxLength={300} />
        </div>
      )}
    </JsonForm>
  );
}

export function InviteOwnerButton({ ownerId, portal }: { ownerId: number; portal: string }) {
  const router = useRouter();
  const [message, setMessage] = useState<string | null>(null);
  if (portal === "active") return <p className="text-sm text-pass-700">Uses the owner portal.</p>;
  return (
    <div className="space-y-2">
      <Button
        variant="secondary"
        onClick={() =>
          void sendJson<{ status: string }>("POST", `/api/inspector/owners/${ownerId}/invitation`).then((r) => {
            setMessage(r.ok ? (r.data.status === "linked" ? "Linked to the owner's existing portal account." : "Invitation e-mailed.") : r.error);
            router.refresh();
          })
        }
      >
        {portal === "invited" ? "Re-send the portal invitation" : "Invite to the owner portal"}
      </Button>
      {message ? <p role="status" className="text-sm">{message}</p> : null}
    </div>
  );
}

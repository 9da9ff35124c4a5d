"use client";

import Papa from "papaparse";
import { useRouter } from "next/navigation";
import { useEffect, useRef, useState } from "react";
import { useDropzone } from "react-dropzone";
import useSWR from "swr";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import type { ImportJobView } from "@/lib/data/import-jobs";
import { guessMapping, importFields, IMPORT_MAX_BYTES, type ImportFieldKey, type ImportMapping } from "@/lib/data/import-fields";
import { formatCount } from "./format";
import { fetchJson, sendJson } from "./send-json";

interface Preview {
  file: File;
  header: string[];
  rows: string[][];
  /** Set when the file was converted from Windows-1252 in the browser. */
  convertedFrom: string | null;
}

type Step = { step: "choose" } | { step: "encoding"; file: File; text: string } | { step: "map"; preview: Preview } | { step: "uploading"; preview: Preview; loaded: number } | { step: "job"; jobId: number; fileName: string };

const MB = 1024 * 1024;

function previewOf(file: File, text: string, convertedFrom: string | null): Preview | string {
  const parsed = Papa.parse<string[]>(text, { preview: 11, skipEmptyLines: "greedy", delimitersToGuess: [",", ";", "\t", "|"] });
  const header = (parsed.data[0] ?? []).map((h) => h.replace(/^\uFEFF/, "").trim());
  if (header.length === 0 || header.every((h) => !h)) return "The file is empty: its first line must name the columns.";
  if (header.length === 1 && text.length > 200) return "Only one column was found: the file may not be separated by commas, semicolons or tabs.";
  return { file, header, rows: parsed.data.slice(1, 11), convertedFrom };
}

/** Uploads with progress (fetch cannot report upload progress). */
function upload(file: File, onProgress: (loaded: number) => void): Promise<{ ok: true; id: number } | { ok: false; error: string }> {
  return new Promise((resolve) => {
    const xhr = new XMLHttpRequest();
    xhr.open("POST", "/api/files?purpose=inventory_import");
    xhr.upload.onprogress = (e) => onProgress(e.loaded);
    xhr.onload = () => {
      const body = (() => {
        try {
          return JSON.parse(xhr.responseText) as { id?: number; error?: string };
        } catch {
          return {};
        }
      })();
      if (xhr.status === 201 && body.id) resolve({ ok: true, id: body.id });
      else resolve({ ok: false, error: body.error ?? `The upload failed (${xhr.status}).` });
    };
    xhr.onerror = () => resolve({ ok: false, error: "The upload was interrupted: check the connection and try again." });
    const form = new FormData();
    form.append("file", file);
    xhr.send(form);
  });
}

export function ImportWizard({ initialJobId, initialJobFile }: { initialJobId?: number; initialJobFile?: string }) {
  const [state, setState] = useState<Step>(initialJobId ? { step: "job", jobId: initialJobId, fileName: initialJobFile ?? "" } : { step: "choose" });
  const [mapping, setMapping] = useState<ImportMapping>({});
  const [error, setError] = useState<string | null>(null);

  const accept = async (file: File) => {
    setError(null);
    if (file.size >= IMPORT_MAX_BYTES) {
      setError(`“${file.name}” is ${(file.size / MB).toFixed(1)} MB; an import takes files under ${IMPORT_MAX_BYTES / MB} MB. Split it into parts, each with the header row, and import them one after the other.`);
      return;
    }
    if (file.size === 0) {
      setError(`“${file.name}” is empty.`);
      return;
    }
    const bytes = new Uint8Array(await file.arrayBuffer());
    if ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff)) {
      setError("This file is saved as UTF-16 text. Save it as “CSV UTF-8” from the spreadsheet and choose it again.");
      return;
    }
    if (bytes.subarray(0, 4096).includes(0)) {
      setError("This is not a text file: export the inventory as CSV (comma-separated values) and choose that.");
      return;
    }
    let text: string;
    try {
      text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
    } catch {
      setState({ step: "encoding", file, text: new TextDecoder("windows-1252").decode(bytes) });
      return;
    }
    const preview = previewOf(file, text, null);
    if (typeof preview === "string") return setError(preview);
    setMapping(guessMapping(preview.header));
    setState({ step: "map", preview });
  };

  const dropzone = useDropzone({
    multiple: false,
    accept: { "text/csv": [".csv", ".txt"], "text/plain": [".csv", ".txt"], "application/vnd.ms-excel": [".csv"] },
    onDropAccepted: (files) => void accept(files[0]!),
    onDropRejected: (rejections) => setError(rejections[0]?.file.name.match(/\.(xlsx?|ods)$/i) ? "This is a spreadsheet file: save it as “CSV UTF-8” first." : "Choose one CSV file."),
  });

  const start = async (preview: Preview) => {
    setError(null);
    setState({ step: "uploading", preview, loaded: 0 });
    const uploaded = await upload(preview.file, (loaded) => setState({ step: "uploading", preview, loaded }));
    if (!uploaded.ok) {
      setError(uploaded.error);
      setState({ step: "map", preview });
      return;
    }
    const started = await sendJson<{ jobId: number }>("POST", "/api/inspector/imports", { fileId: uploaded.id, mapping });
    if (!started.ok) {
      setError(started.fieldErrors.file?.[0] ?? started.error);
      setState({ step: "map", preview });
      return;
    }
    setState({ step: "job", jobId: started.data.jobId, fileName: preview.file.name });
    history.replaceState(null, "", `/inspector/inventory/import?job=${started.data.jobId}`);
  };

  return (
    <div className="space-y-5">
      {error ? (
        <Alert tone="danger" title="The file was not imported" live>
          {error}
        </Alert>
      ) : null}

      {state.step === "choose" ? (
        <div {...dropzone.getRootProps({ className: `flex min-h-44 cursor-pointer flex-col items-center justify-center rounded-lg border-2 border-dashed p-8 text-center ${dropzone.isDragActive ? "border-estuary-600 bg-estuary-50" : "border-ink-200 bg-white hover:border-estuary-300"}` })}>
          <input {...dropzone.getInputProps({ "aria-label": "Choose the inventory CSV file" })} />
          <p className="text-lg font-semibold text-ink-900">Drop the inventory CSV here, or click to choose it</p>
          <p className="mt-1 text-sm text-ink-600">UTF-8 text, the first line naming the columns, up to {IMPORT_MAX_BYTES / MB} MB (about 250,000 rows). Nothing is imported before you have checked the columns.</p>
        </div>
      ) : null}

      {state.step === "encoding" ? (
        <Alert tone="warning" title="This file is not UTF-8 text">
          <p>Its characters look like Windows-1252 (what older spreadsheets save). Here is how its first line reads that way:</p>
          <p className="my-2 rounded bg-white px-2 py-1 font-mono text-xs text-ink-800">{state.text.split(/\r?\n/, 1)[0]?.slice(0, 200)}</p>
          <div className="mt-2 flex flex-wrap gap-2">
            <Button
              size="sm"
              onClick={() => {
                const converted = new File([state.text], state.file.name, { type: "text/csv" });
                const preview = previewOf(converted, state.text, "Windows-1252");
                if (typeof preview === "string") return setError(preview);
                setMapping(guessMapping(preview.header));
                setState({ step: "map", preview });
              }}
            >
              Convert it to UTF-8 and continue
            </Button>
            <Button size="sm" variant="secondary" onClick={() => setState({ step: "choose" })}>
              Choose another file
            </Button>
          </div>
        </Alert>
      ) : null}

      {state.step === "map" || state.step === "uploading" ? <MappingStep preview={state.preview} mapping={mapping} setMapping={setMapping} isBusy={state.step === "uploading"} loaded={state.step === "uploading" ? state.loaded : 0} onStart={() => void start(state.preview)} onCancel={() => setState({ step: "choose" })} /> : null}

      {state.step === "job" ? (
        <JobProgress
          jobId={state.jobId}
          onAnother={() => {
            history.replaceState(null, "", "/inspector/inventory/import");
            setState({ step: "choose" });
          }}
        />
      ) : null}
    </div>
  );
}

function MappingStep({ preview, mapping, setMapping, isBusy, loaded, onStart, onCancel }: { preview: Preview; mapping: ImportMapping; setMapping: (m: ImportMapping) => void; isBusy: boolean; loaded: number; onStart: () => void; onCancel: () => void }) {
  const usedBy = new Map(Object.entries(mapping).filter(([, c]) => c).map(([k, c]) => [c, k as ImportFieldKey]));
  const missingRequired = importFields.filter((f) => f.isRequired && !mapping[f.key]);
  const groups = [
    ["site", "The site"],
    ["owner", "The owner"],
    ["assembly", "The assembly"],
  ] as const;
  return (
    <div className="space-y-5">
      <div className="rounded-lg border border-ink-200 bg-white p-4 shadow-sm">
        <p className="font-semibold">
          {preview.file.name} · {(preview.file.size / 1024).toFixed(0)} KB · {preview.header.length} columns
          {preview.convertedFrom ? ` · converted from ${preview.convertedFrom}` : ""}
        </p>
        <p className="text-sm text-ink-600">Check which column holds what. The guesses come from the column names; change any that are wrong. Blank cells leave what is on file unchanged, so importing a corrected file again only adds and corrects.</p>
      </div>
      <div className="grid gap-4 lg:grid-cols-3">
        {groups.map(([group, title]) => (
          <fieldset key={group} className="space-y-3 rounded-lg border border-ink-200 bg-white p-4 shadow-sm">
            <legend className="px-1 font-semibold">{title}</legend>
            {importFields
              .filter((f) => f.group === group)
              .map((field) => (
                <div key={field.key} className="space-y-1">
                  <label htmlFor={`map-${field.key}`} className="block text-sm font-semibold text-ink-800">
                    {field.label}
                    {field.isRequired ? <span className="text-fail-600"> *</span> : null}
                  </label>
                  <select
                    id={`map-${field.key}`}
                    className="block w-full rounded-md border border-ink-200 bg-white px-2.5 py-1.5 text-sm"
                    value={mapping[field.key] ?? ""}
                    onChange={(e) => {
                      const next = { ...mapping };
                      // One column feeds one field: taking it here frees it elsewhere.
                      for (const [k, c] of Object.entries(next)) if (c === e.target.value) delete next[k as ImportFieldKey];
                      if (e.target.value) next[field.key] = e.target.value;
                      else delete next[field.key];
                      setMapping(next);
                    }}
                  >
                    <option value="">— not in the file —</option>
                    {preview.header.map((h, i) =>
                      h ? (
                        <option key={`${h}-${i}`} value={h}>
                          {h}
                          {usedBy.get(h) && usedBy.get(h) !== field.key ? " (used)" : ""}
                        </option>
                      ) : null,
                    )}
                  </select>
                  {field.hint ? <p className="text-xs text-ink-600">{field.hint}</p> : null}
                </div>
              ))}
          </fieldset>
        ))}
      </div>
      <div className="rounded-lg border border-ink-200 bg-white p-4 shadow-sm">
        <h2 className="mb-2">The first rows</h2>
        <div className="overflow-x-auto">
          <table className="w-full text-left text-xs">
            <thead>
              <tr className="border-b border-ink-200">
                {preview.header.map((h, i) => (
                  <th key={`${h}-${i}`} scope="col" className="whitespace-nowrap px-2 py-1.5 align-bottom">
                    <span className="block font-semibold text-ink-900">{h || <em>(no name)</em>}</span>
                    <span className={`block font-normal ${usedBy.get(h) ? "text-estuary-700" : "text-ink-400"}`}>{usedBy.get(h) ? `→ ${importFields.find((f) => f.key === usedBy.get(h))?.label}` : "not imported"}</span>
                  </th>
                ))}
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {preview.rows.map((row, r) => (
                <tr key={r}>
                  {preview.header.map((_, i) => (
                    <td key={i} className={`whitespace-nowrap px-2 py-1 ${usedBy.get(preview.header[i]!) ? "" : "text-ink-400"}`}>
                      {row[i] ?? ""}
                    </td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </div>
      {missingRequired.length ? <p className="text-sm font-semibold text-fail-700">Choose the column for: {missingRequired.map((f) => f.label).join(", ")}.</p> : null}
      {isBusy ? (
        <div className="space-y-1" aria-live="polite">
          <p className="text-sm">
            Uploading… {formatCount(Math.round(loaded / 1024))} of {formatCount(Math.round(preview.file.size / 1024))} KB
          </p>
          <progress className="h-3 w-full accent-estuary-700" max={preview.file.size} value={loaded} />
        </div>
      ) : null}
      <div className="flex flex-wrap gap-2">
        <Button onClick={onStart} disabled={isBusy || missingRequired.length > 0}>
          Check every row and import
        </Button>
        <Button variant="secondary" onClick={onCancel} disabled={isBusy}>
          Choose another file
        </Button>
      </div>
    </div>
  );
}

function JobProgress({ jobId, onAnother }: { jobId: number; onAnother: () => void }) {
  const router = useRouter();
  const { data: job, error } = useSWR<ImportJobView, Error>(`/api/inspector/imports/${jobId}`, (url: string) => fetchJson<ImportJobView>(url), {
    refreshInterval: (latest) => (latest && latest.status !== "running" ? 0 : 800),
  });
  // When the run ends, the page's list of recent imports is read again.
  const wasRunning = useRef(false);
  useEffect(() => {
    if (job?.status === "running") wasRunning.current = true;
    else if (job && wasRunning.current) {
      wasRunning.current = false;
      router.refresh();
    }
  }, [job, router]);
  if (error) return <Alert tone="danger">{(error).message}</Alert>;
  if (!job) return <p className="text-ink-600">Loading the import…</p>;
  const percent = job.totalRows ? Math.round((job.processedRows / job.totalRows) * 100) : 0;
  return (
    <div className="space-y-4 rounded-lg border border-ink-200 bg-white p-5 shadow-sm" aria-live="polite">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2>{job.fileName}</h2>
        <span className="text-sm text-ink-600">started by {job.startedBy}</span>
      </div>
      {job.status === "running" ? (
        <>
          <p>{job.phase === "checking" ? "Checking the rows…" : `Importing… ${formatCount(job.processedRows)} of ${formatCount(job.totalRows)} rows (${percent}%)`}</p>
          <progress className="h-4 w-full accent-estuary-700" max={job.totalRows || 1} value={job.processedRows} aria-label="Import progress" />
        </>
      ) : (
        <Alert tone={job.status === "failed" ? "danger" : job.failedRows ? "warning" : "success"} title={job.status === "failed" ? "The import stopped" : job.failedRows ? "Imported, with rows left out" : "Imported"}>
          {job.message}
        </Alert>
      )}
      <dl className="grid grid-cols-2 gap-3 text-center sm:grid-cols-4">
        {[
          ["New", job.insertedRows, "text-pass-700"],
          ["Updated", job.updatedRows, "text-estuary-700"],
          ["Unchanged", job.unchangedRows, "text-ink-800"],
          ["Not imported", job.failedRows, job.failedRows ? "text-fail-700" : "text-ink-800"],
        ].map(([label, value, tone]) => (
          <div key={label as string} className="rounded-md border border-ink-100 px-3 py-2">
            <dt className="text-xs font-semibold uppercase tracking-wide text-ink-600">{label}</dt>
            <dd className={`text-2xl font-bold tabular-nums ${tone as string}`}>{formatCount(value as number)}</dd>
          </div>
        ))}
      </dl>
      {job.errorFileId ? (
        <p>
          <a href={`/api/files/${job.errorFileId}`} className="font-semibold">
            Download the rows that were not imported, with the reason for each (CSV)
          </a>{" "}
          <span className="text-sm text-ink-600">— correct them there and import that file.</span>
        </p>
      ) : null}
      {job.status !== "running" ? (
        <div className="flex gap-2">
          <Button variant="secondary" onClick={onAnother}>
            Import another file
          </Button>
          <a href="/inspector/inventory" className="self-center">
            Open the inventory
          </a>
        </div>
      ) : null}
    </div>
  );
}

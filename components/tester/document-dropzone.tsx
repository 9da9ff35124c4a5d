"use client";

import { useState } from "react";
import { useDropzone, type FileRejection } from "react-dropzone";

export interface UploadedDocument {
  id: number;
  originalName: string;
}

const megabytes = (bytes: number) => `${(bytes / 1024 / 1024).toFixed(0)} MB`;

function rejectionMessage(rejections: FileRejection[], maxBytes: number): string {
  const code = rejections[0]?.errors[0]?.code;
  if (code === "file-too-large") return `The file is larger than ${megabytes(maxBytes)}.`;
  if (code === "file-invalid-type") return "Upload a PDF, JPEG or PNG file.";
  if (code === "too-many-files") return "One file at a time.";
  return rejections[0]?.errors[0]?.message ?? "That file cannot be uploaded.";
}

/**
 * Drop or pick one document (PDF, JPEG or PNG). The browser's checks are a convenience: the
 * server looks at the file's content, not its name, and enforces the size limit.
 */
export function DocumentDropzone({ id, purpose, maxBytes, label, uploaded, onUploaded }: { id: string; purpose: "certification" | "kit_verification"; maxBytes: number; label: string; uploaded: UploadedDocument | null; onUploaded: (document: UploadedDocument | null) => void }) {
  const [error, setError] = useState<string | null>(null);
  const [isUploading, setUploading] = useState(false);
  async function handleDrop(accepted: File[], rejected: FileRejection[]) {
    setError(null);
    if (rejected.length) return setError(rejectionMessage(rejected, maxBytes));
    const file = accepted[0];
    if (!file) return;
    setUploading(true);
    try {
      const form = new FormData();
      form.append("file", file);
      const response = await fetch(`/api/files?purpose=${purpose}`, { method: "POST", body: form });
      const body = (await response.json().catch(() => null)) as { id?: number; originalName?: string; error?: string } | null;
      if (response.status === 201 && body?.id) onUploaded({ id: body.id, originalName: body.originalName ?? file.name });
      else setError(body?.error ?? "The upload failed; try again.");
    } catch {
      setError("No signal: the file was not uploaded. Try again when you are back online.");
    }
    setUploading(false);
  }
  const { getRootProps, getInputProps, isDragActive } = useDropzone({
    accept: { "application/pdf": [".pdf"], "image/jpeg": [".jpg", ".jpeg"], "image/png": [".png"] },
    maxSize: maxBytes,
    multiple: false,
    disabled: isUploading,
    onDrop: (accepted, rejected) => void handleDrop(accepted, rejected),
  });
  return (
    <div>
      <p id={`${id}-label`} className="text-sm font-semibold text-ink-800">
        {label}
      </p>
      {uploaded ? (
        <div className="mt-1 flex flex-wrap items-center justify-between gap-2 rounded-md border border-pass-600/30 bg-pass-50 px-3 py-2 text-sm">
          <span className="text-pass-700">
            ✓ <a href={`/api/files/${uploaded.id}`} target="_blank" rel="noopener">{uploaded.originalName}</a>
          </span>
          <button type="button" className="font-semibold text-ink-800 underline" onClick={() => onUploaded(null)}>
            Use another file
          </button>
        </div>
      ) : (
        <div
          {...getRootProps({
            className: `mt-1 flex min-h-24 cursor-pointer flex-col items-center justify-center rounded-md border-2 border-dashed px-4 py-4 text-center ${isDragActive ? "border-estuary-600 bg-estuary-50" : error ? "border-fail-600 bg-fail-50" : "border-ink-200 bg-ink-50"}`,
            "aria-labelledby": `${id}-label`,
            "aria-describedby": `${id}-hint${error ? ` ${id}-error` : ""}`,
          })}
        >
          <input {...getInputProps({ id })} data-testid={`${id}-input`} />
          <span className="font-semibold text-estuary-800">{isUploading ? "Uploading…" : isDragActive ? "Drop it here" : "Take a photo or choose a file"}</span>
          <span id={`${id}-hint`} className="text-sm text-ink-600">
            PDF, JPEG or PNG, up to {megabytes(maxBytes)}
          </span>
        </div>
      )}
      {error ? (
        <p id={`${id}-error`} role="alert" className="mt-1 text-sm font-semibold text-fail-700">
          {error}
        </p>
      ) : null}
    </div>
  );
}

// How a draft is kept on the phone and on the server, and what the tester is told about it.
// Every change bumps the draft's clientRevision; the server keeps a save only when its revision
// is higher than the one it has, so a slow, older request can never overwrite a newer draft. Pure.
import type { FieldTestDraft } from "./field-test-draft";

/** A draft as the phone keeps it (localStorage), with what the server last confirmed. */
export interface StoredDraft {
  clientKey: string;
  clientRevision: number;
  /** ISO time of the last change on this phone. */
  savedAt: string;
  /** The highest revision the server said it holds; null = never reached the server. */
  serverRevision: number | null;
  /** The idempotency key this draft is submitted with, kept so a retry after a reload files it once. */
  submitKey: string;
  data: FieldTestDraft;
}

/** A stored draft read back from localStorage, or null for anything else (an old format, a damaged entry). */
export function parseStoredDraft(value: unknown, parseData: (data: unknown) => FieldTestDraft | null): StoredDraft | null {
  if (!value || typeof value !== "object") return null;
  const record = value as Record<string, unknown>;
  const data = parseData(record.data);
  if (!data) return null;
  if (typeof record.clientKey !== "string" || typeof record.clientRevision !== "number" || typeof record.savedAt !== "string" || typeof record.submitKey !== "string") return null;
  const serverRevision = typeof record.serverRevision === "number" ? record.serverRevision : null;
  return { clientKey: record.clientKey, clientRevision: record.clientRevision, savedAt: record.savedAt, serverRevision, submitKey: record.submitKey, data };
}

/** Per tester: on a phone the crew shares, one tester never resumes another's draft. */
export function localDraftPrefix(testerId: number): string {
  return `zw:draft:${testerId}:`;
}

export function localDraftKey(testerId: number, clientKey: string): string {
  return `${localDraftPrefix(testerId)}${clientKey}`;
}

/** The fresher of the phone's and the server's copy of one draft (the higher revision; the phone's on a tie). */
export function pickFresherDraft<T extends { clientRevision: number }>(local: T | null, server: T | null): T | null {
  if (!local) return server;
  if (!server) return local;
  return server.clientRevision > local.clientRevision ? server : local;
}

/** Drafts a tester could mean when opening a test for this assembly (the same correction or amendment, if any). */
export function findResumableDraft(drafts: readonly StoredDraft[], target: { assemblyId: number; correctsReportId: number | null; amendsReportId: number | null }): StoredDraft | null {
  const matching = drafts.filter((d) => d.data.assemblyId === target.assemblyId && d.data.correctsReportId === target.correctsReportId && d.data.amendsReportId === target.amendsReportId);
  matching.sort((a, b) => (a.savedAt < b.savedAt ? 1 : a.savedAt > b.savedAt ? -1 : 0));
  return matching[0] ?? null;
}

export type ServerSyncState = "idle" | "saving" | "saved" | "offline" | "failed" | "signed_out";

export interface SaveStatus {
  tone: "pass" | "caution" | "fail" | "muted";
  text: string;
}

/** The words under the form's title: where the draft is, right now. */
export function describeSaveStatus(args: { hasLocalCopy: boolean; isLocalStorageAvailable: boolean; server: ServerSyncState; isDirty: boolean; lastServerSave: string | null }): SaveStatus {
  const { hasLocalCopy, isLocalStorageAvailable, server, isDirty } = args;
  const local = hasLocalCopy ? "Saved on this phone" : isLocalStorageAvailable ? "Not saved yet" : "This browser cannot keep a copy";
  switch (server) {
    case "saved":
      return isDirty ? { tone: "caution", text: `${local} · saving to the server…` } : { tone: "pass", text: `${local} · saved to the server${args.lastServerSave ? ` at ${args.lastServerSave}` : ""}` };
    case "saving":
      return { tone: "caution", text: `${local} · saving to the server…` };
    case "offline":
      return { tone: "caution", text: `Offline · ${hasLocalCopy ? "saved on this phone; it goes to the server when the signal is back" : "keep this page open until the signal is back"}` };
    case "failed":
      return { tone: "caution", text: `${local} · the server did not answer; trying again` };
    case "signed_out":
      return { tone: "fail", text: `${local} · sign in again (in another tab) to save to the server` };
    case "idle":
      return { tone: "muted", text: hasLocalCopy ? local : "Nothing typed yet" };
  }
}

export type SubmitOutcome =
  | { kind: "submitted"; reportId: number; reportNumber: string }
  | { kind: "invalid"; message: string; fieldErrors: Record<string, string[]> }
  | { kind: "retry"; message: string }
  | { kind: "signed_out"; message: string };

/**
 * The server's answer to a submission → what the form does. Anything that may be temporary (no
 * signal, a 503, a 500) keeps the draft and the same idempotency key, so trying again can never
 * file the report twice.
 */
export function interpretSubmitResponse(status: number | null, body: unknown): SubmitOutcome {
  const record = (body && typeof body === "object" ? body : {}) as { error?: unknown; fieldErrors?: unknown; id?: unknown; reportNumber?: unknown };
  const message = typeof record.error === "string" ? record.error : "";
  if (status === null) return { kind: "retry", message: "No signal: the report is saved on this phone. Submit again when you are back online; it will be filed once." };
  if ((status === 200 || status === 201) && typeof record.id === "number") return { kind: "submitted", reportId: record.id, reportNumber: typeof record.reportNumber === "string" ? record.reportNumber : "" };
  if (status === 401) return { kind: "signed_out", message: "Your session has ended. Sign in again in another tab, then submit: the report is saved on this phone." };
  if (status === 422 || status === 409 || status === 404 || status === 403 || status === 400 || status === 413) {
    const fieldErrors = record.fieldErrors && typeof record.fieldErrors === "object" ? (record.fieldErrors as Record<string, string[]>) : {};
    return { kind: "invalid", message: message || "The report was not accepted: check the highlighted fields.", fieldErrors };
  }
  return { kind: "retry", message: message || "The server did not answer. The report is saved on this phone; submit again in a moment." };
}

/** Where an unfinished test is continued. */
export function draftHref(draft: { assemblyId: number | null; correctsReportId: number | null; amendsReportId: number | null }): string {
  if (draft.correctsReportId) return `/tester/reports/new?corrects=${draft.correctsReportId}`;
  if (draft.amendsReportId) return `/tester/reports/new?amends=${draft.amendsReportId}`;
  return `/tester/reports/new?assembly=${draft.assemblyId ?? ""}`;
}

"use client";

import { useCallback, useEffect, useRef, useState } from "react";
import { parseDraft, type FieldTestDraft } from "@/lib/forms/field-test-draft";
import { localDraftKey, localDraftPrefix, parseStoredDraft, type ServerSyncState, type StoredDraft } from "@/lib/forms/draft-sync";

const SERVER_SAVE_DELAY_MS = 1200;
const RETRY_DELAY_MS = 10_000;

/** Every draft this phone holds for this tester (damaged entries are skipped). */
export function readLocalDrafts(testerId: number): StoredDraft[] {
  const drafts: StoredDraft[] = [];
  try {
    for (let index = 0; index < localStorage.length; index++) {
      const key = localStorage.key(index);
      if (!key?.startsWith(localDraftPrefix(testerId))) continue;
      const stored = parseStoredDraft(JSON.parse(localStorage.getItem(key) ?? "null"), parseDraft);
      if (stored) drafts.push(stored);
    }
  } catch {
    /* storage blocked (private mode): the server copy is all there is */
  }
  return drafts;
}

export function removeLocalDraft(testerId: number, clientKey: string): void {
  try {
    localStorage.removeItem(localDraftKey(testerId, clientKey));
  } catch {
    /* nothing to remove */
  }
}

function writeLocalDraft(testerId: number, stored: StoredDraft): boolean {
  try {
    localStorage.setItem(localDraftKey(testerId, stored.clientKey), JSON.stringify(stored));
    return true;
  } catch {
    return false;
  }
}

export interface DraftSync {
  draft: FieldTestDraft;
  revision: number;
  update: (mutate: (draft: FieldTestDraft) => void) => void;
  serverState: ServerSyncState;
  hasLocalCopy: boolean;
  isLocalStorageAvailable: boolean;
  /** Local changes the server does not have yet. */
  isDirty: boolean;
  lastServerSave: string | null;
  /** Forget the draft here and on the server. */
  discard: () => Promise<void>;
  /** After a successful submission: the server already removed its copy. */
  forgetLocally: () => void;
  /** Before submitting: no more saves, and the one in flight (if any) has landed. */
  pause: () => Promise<void>;
  /** After a submission that did not go through: saving goes on. */
  resume: () => void;
}

/**
 * The draft as the tester types: every change is written to this phone at once and, a moment
 * later, to the server (a newer revision always wins there). Without a signal the phone's copy
 * is kept and sent when the browser is back online.
 */
export function useDraftSync(testerId: number, start: StoredDraft): DraftSync {
  const [state, setState] = useState({ draft: start.data, revision: start.clientRevision });
  const latest = useRef({ draft: start.data, revision: start.clientRevision });
  const serverRevision = useRef<number>(start.serverRevision ?? 0);
  const [serverState, setServerState] = useState<ServerSyncState>(start.serverRevision !== null && start.serverRevision >= start.clientRevision ? "saved" : "idle");
  const [hasLocalCopy, setHasLocalCopy] = useState(false);
  const [isLocalStorageAvailable, setLocalStorageAvailable] = useState(true);
  const [lastServerSave, setLastServerSave] = useState<string | null>(null);
  const [serverHeld, setServerHeld] = useState(start.serverRevision ?? 0);
  const timer = useRef<ReturnType<typeof setTimeout> | null>(null);
  const inFlight = useRef<Promise<void> | null>(null);
  const isDiscarded = useRef(false);
  const isPaused = useRef(false);

  const persistLocally = useCallback(() => {
    const { draft, revision } = latest.current;
    const ok = writeLocalDraft(testerId, { clientKey: start.clientKey, clientRevision: revision, savedAt: new Date().toISOString(), serverRevision: serverRevision.current || null, submitKey: start.submitKey, data: draft });
    setHasLocalCopy(ok);
    setLocalStorageAvailable(ok);
  }, [testerId, start.clientKey, start.submitKey]);

  const pushToServer = useCallback(async (): Promise<void> => {
    if (isDiscarded.current || isPaused.current || inFlight.current) return;
    const { draft, revision } = latest.current;
    if (revision <= serverRevision.current) return;
    if (typeof navigator !== "undefined" && navigator.onLine === false) {
      setServerState("offline");
      return;
    }
    setServerState("saving");
    const request = (async () => {
      try {
        const response = await fetch(`/api/reports/drafts/${start.clientKey}`, {
          method: "PUT",
          headers: { "content-type": "application/json" },
          body: JSON.stringify({ clientRevision: revision, data: draft }),
        });
        if (response.status === 401) setServerState("signed_out");
        else if (!response.ok) {
          setServerState("failed");
          timer.current = setTimeout(() => void pushToServer(), RETRY_DELAY_MS);
        } else {
          const body = (await response.json()) as { clientRevision: number };
          serverRevision.current = Math.max(serverRevision.current, body.clientRevision);
          setServerHeld(serverRevision.current);
          setLastServerSave(new Date().toLocaleTimeString([], { hour: "2-digit", minute: "2-digit" }));
          setServerState("saved");
          persistLocally();
        }
      } catch {
        setServerState(typeof navigator !== "undefined" && navigator.onLine === false ? "offline" : "failed");
        timer.current = setTimeout(() => void pushToServer(), RETRY_DELAY_MS);
      }
    })();
    inFlight.current = request;
    await request;
    inFlight.current = null;
    // Typed while the request was out: send the newer revision too.
    if (latest.current.revision > serverRevision.current && !isDiscarded.current && !isPaused.current) {
      if (timer.current) clearTimeout(timer.current);
      timer.current = setTimeout(() => void pushToServer(), SERVER_SAVE_DELAY_MS);
    }
  }, [persistLocally, start.clientKey]);

  const pause = useCallback(async () => {
    isPaused.current = true;
    if (timer.current) clearTimeout(timer.current);
    // A save still on its way must land before the submission, which removes the server's copy.
    if (inFlight.current) await inFlight.current;
  }, []);

  const resume = useCallback(() => {
    isPaused.current = false;
    if (timer.current) clearTimeout(timer.current);
    timer.current = setTimeout(() => void pushToServer(), SERVER_SAVE_DELAY_MS);
  }, [pushToServer]);

  const update = useCallback((mutate: (draft: FieldTestDraft) => void) => {
    setState((previous) => {
      const next = structuredClone(previous.draft);
      mutate(next);
      return { draft: next, revision: previous.revision + 1 };
    });
  }, []);

  // Each new revision: to this phone at once, to the server after a short pause in typing.
  useEffect(() => {
    latest.current = state;
    if (isDiscarded.current) return;
    if (isPaused.current) {
      persistLocally();
      return;
    }
    // Nothing changed since the form opened: a fresh test is not saved until something is typed,
    // and a resumed one only if the server lacks this phone's latest revision.
    if (state.revision === start.clientRevision && (start.clientRevision === 0 || (start.serverRevision ?? 0) >= start.clientRevision)) return;
    persistLocally();
    if (timer.current) clearTimeout(timer.current);
    timer.current = setTimeout(() => void pushToServer(), SERVER_SAVE_DELAY_MS);
  }, [state, persistLocally, pushToServer, start.clientRevision, start.serverRevision]);

  useEffect(() => {
    const online = () => void pushToServer();
    const offline = () => setServerState("offline");
    window.addEventListener("online", online);
    window.addEventListener("offline", offline);
    return () => {
      window.removeEventListener("online", online);
      window.removeEventListener("offline", offline);
      if (timer.current) clearTimeout(timer.current);
    };
  }, [pushToServer]);

  const discard = useCallback(async () => {
    isDiscarded.current = true;
    if (timer.current) clearTimeout(timer.current);
    removeLocalDraft(testerId, start.clientKey);
    setHasLocalCopy(false);
    await fetch(`/api/reports/drafts/${start.clientKey}`, { method: "DELETE" }).catch(() => null);
  }, [testerId, start.clientKey]);

  const forgetLocally = useCallback(() => {
    isDiscarded.current = true;
    if (timer.current) clearTimeout(timer.current);
    removeLocalDraft(testerId, start.clientKey);
  }, [testerId, start.clientKey]);

  return {
    draft: state.draft,
    revision: state.revision,
    update,
    serverState,
    hasLocalCopy,
    isLocalStorageAvailable,
    isDirty: state.revision > serverHeld,
    lastServerSave,
    discard,
    forgetLocally,
    pause,
    resume,
  };
}

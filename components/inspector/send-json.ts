// The browser side of the staff route handlers: JSON in, JSON out, the server's message on error.

export type SendResult<T> = { ok: true; data: T } | { ok: false; status: number; error: string; fieldErrors: Record<string, string[]>; code?: string };

export async function sendJson<T = unknown>(method: "POST" | "PUT" | "PATCH" | "DELETE", url: string, body?: unknown): Promise<SendResult<T>> {
  try {
    const response = await fetch(url, { method, headers: { "content-type": "application/json" }, body: body === undefined ? undefined : JSON.stringify(body) });
    const payload = (await response.json().catch(() => ({}))) as Record<string, unknown>;
    if (response.ok) return { ok: true, data: payload as T };
    return {
      ok: false,
      status: response.status,
      error: typeof payload.error === "string" ? payload.error : `The server answered ${response.status}.`,
      fieldErrors: (payload.fieldErrors as Record<string, string[]>) ?? {},
      code: typeof payload.code === "string" ? payload.code : undefined,
    };
  } catch {
    return { ok: false, status: 0, error: "No connection to the server. Check the network and try again.", fieldErrors: {} };
  }
}

/** swr's fetcher: throws the server's message so the page can show it. */
export async function fetchJson<T>(url: string): Promise<T> {
  const response = await fetch(url, { headers: { accept: "application/json" } });
  const payload = (await response.json().catch(() => ({}))) as T & { error?: string };
  if (!response.ok) throw new Error(payload.error ?? `The server answered ${response.status}.`);
  return payload;
}

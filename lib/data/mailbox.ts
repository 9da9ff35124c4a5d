import "server-only";
import { assertCan, type Actor } from "@/lib/auth/permissions";
import { getEnv } from "@/lib/env";

export interface MailboxMessage {
  id: string;
  created_at: string;
  from: string;
  to: string[];
  subject: string;
  html?: string;
  text?: string;
}

/** The messages the local mail stand-in kept (development and tests only). */
export async function listMailboxMessages(actor: Actor, options: { to?: string; limit?: number } = {}): Promise<{ available: boolean; messages: MailboxMessage[]; total: number }> {
  assertCan(actor, "mailbox.view");
  const base = getEnv().MAIL_STANDIN_URL;
  if (!base) return { available: false, messages: [], total: 0 };
  const url = new URL("/_messages", base);
  url.searchParams.set("limit", String(options.limit ?? 100));
  if (options.to) url.searchParams.set("to", options.to);
  try {
    const response = await fetch(url, { cache: "no-store" });
    if (!response.ok) return { available: false, messages: [], total: 0 };
    const body = (await response.json()) as { total: number; data: MailboxMessage[] };
    return { available: true, messages: body.data, total: body.total };
  } catch {
    return { available: false, messages: [], total: 0 };
  }
}

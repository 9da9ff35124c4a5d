const MAIL_URL = process.env.MAIL_STANDIN_URL ?? "http://127.0.0.1:3035";

export interface CapturedMessage {
  id: string;
  created_at: string;
  from: string;
  to: string[];
  subject: string;
  html?: string;
  text?: string;
  reply_to?: string[];
}

export async function messagesTo(address: string): Promise<CapturedMessage[]> {
  const response = await fetch(`${MAIL_URL}/_messages?to=${encodeURIComponent(address)}&limit=500`);
  const body = (await response.json()) as { data: CapturedMessage[] };
  return body.data;
}

/** Waits for a message to arrive (mail is sent after the response in some flows). */
export async function waitForMessage(address: string, match: (m: CapturedMessage) => boolean = () => true, timeoutMs = 10_000): Promise<CapturedMessage> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const found = (await messagesTo(address)).find(match);
    if (found) return found;
    if (Date.now() > deadline) throw new Error(`No message to ${address} within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 150));
  }
}

export async function controlMailStandIn(settings: { failAfter?: number | null; failStatus?: number; delayMs?: number }): Promise<void> {
  await fetch(`${MAIL_URL}/_control`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(settings) });
}

export function firstLink(message: CapturedMessage, pathPrefix: string): string {
  const text = `${message.text ?? ""} ${message.html ?? ""}`;
  const match = text.match(new RegExp(`https?://[^\\s"'<>]*${pathPrefix.replace(/[/]/g, "\\/")}[^\\s"'<>]*`));
  if (!match) throw new Error(`No ${pathPrefix} link in "${message.subject}"`);
  return match[0].replace(/&amp;/g, "&");
}

// Random keys for drafts and submissions, made in the browser. crypto.getRandomValues works on
// plain http too (randomUUID needs a secure context, which a site office's LAN may not be).
export function newClientKey(): string {
  const bytes = new Uint8Array(16);
  crypto.getRandomValues(bytes);
  return Array.from(bytes, (b) => b.toString(16).padStart(2, "0")).join("");
}

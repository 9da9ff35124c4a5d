import "server-only";
import { Resend } from "resend";
import { getEnv } from "@/lib/env";

let client: Resend | undefined;
let clientFor = "";

/**
 * The resend SDK, created lazily so tests can point it elsewhere first. Unset RESEND_BASE_URL
 * means the hosted service; the start and test scripts set it to the local stand-in.
 */
export function getMailClient(): Resend {
  const env = getEnv();
  const key = `${env.RESEND_API_KEY}|${env.RESEND_BASE_URL ?? ""}`;
  if (!client || clientFor !== key) {
    const baseUrl = env.RESEND_BASE_URL?.replace(/\/$/, "");
    client = new Resend(env.RESEND_API_KEY, baseUrl ? { baseUrl } : undefined);
    clientFor = key;
  }
  return client;
}

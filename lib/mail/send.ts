import "server-only";
import { render } from "@react-email/render";
import type { ReactElement } from "react";
import { getEnv } from "@/lib/env";
import { getMailClient } from "./client";

export interface OutgoingEmail {
  to: string | string[];
  subject: string;
  react: ReactElement;
  replyTo?: string;
  fromName?: string;
  tags?: { name: string; value: string }[];
  /** The same key twice sends once (the mail service keeps keys for a day). */
  idempotencyKey?: string;
}

export class MailSendError extends Error {
  constructor(
    message: string,
    public readonly statusCode: number | null,
  ) {
    super(message);
    this.name = "MailSendError";
  }
}

export interface RenderedEmail {
  from: string;
  to: string[];
  subject: string;
  html: string;
  text: string;
  reply_to?: string[];
  tags?: { name: string; value: string }[];
}

/** The sender address with the program's display name in front of the configured mailbox. */
export function fromAddress(fromName?: string): string {
  const configured = getEnv().MAIL_FROM;
  if (!fromName) return configured;
  const address = configured.match(/<([^>]+)>/)?.[1] ?? configured;
  const safeName = fromName.replace(/["<>\r\n]/g, "");
  return `"${safeName}" <${address}>`;
}

export async function renderEmail(email: OutgoingEmail): Promise<RenderedEmail> {
  const [html, text] = await Promise.all([render(email.react), render(email.react, { plainText: true })]);
  return {
    from: fromAddress(email.fromName),
    to: Array.isArray(email.to) ? email.to : [email.to],
    subject: email.subject,
    html,
    text,
    reply_to: email.replyTo ? [email.replyTo] : undefined,
    tags: email.tags,
  };
}

/** Sends one message and returns its id; the SDK answers errors as values, so check them here. */
export async function sendEmail(email: OutgoingEmail): Promise<string> {
  const rendered = await renderEmail(email);
  const { data, error } = await getMailClient().emails.send(
    {
      from: rendered.from,
      to: rendered.to,
      subject: rendered.subject,
      html: rendered.html,
      text: rendered.text,
      replyTo: rendered.reply_to,
      tags: rendered.tags,
    },
    email.idempotencyKey ? { idempotencyKey: email.idempotencyKey } : undefined,
  );
  if (error || !data) throw new MailSendError(error?.message ?? "The mail service gave no answer.", (error as { statusCode?: number } | null)?.statusCode ?? null);
  return data.id;
}

/** Sends up to the service's batch size in one call; returns the ids in order. */
export async function sendEmailBatch(emails: RenderedEmail[], idempotencyKey?: string): Promise<string[]> {
  const { data, error } = await getMailClient().batch.send(
    emails.map((e) => ({ from: e.from, to: e.to, subject: e.subject, html: e.html, text: e.text, replyTo: e.reply_to, tags: e.tags })),
    idempotencyKey ? { idempotencyKey } : undefined,
  );
  if (error || !data) throw new MailSendError(error?.message ?? "The mail service gave no answer.", (error as { statusCode?: number } | null)?.statusCode ?? null);
  return data.data.map((d) => d.id);
}

/** Mail that must not block the user's action: logged on failure, never thrown. */
export async function sendEmailQuietly(email: OutgoingEmail): Promise<string | null> {
  try {
    return await sendEmail(email);
  } catch (error) {
    console.error("[mail] could not send", email.subject, error instanceof Error ? error.message : error);
    return null;
  }
}

export const MAIL_BATCH_SIZE = 100;

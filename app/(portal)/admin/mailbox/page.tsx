import type { Metadata } from "next";
import { Alert } from "@/components/ui/alert";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { listMailboxMessages } from "@/lib/data/mailbox";

export const metadata: Metadata = { title: "Mailbox" };

export default async function MailboxPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const actor = await requirePermission("mailbox.view");
  const params = await searchParams;
  const { available, messages, total } = await listMailboxMessages(actor, { to: params.to, limit: 100 });
  const selected = messages.find((m) => m.id === params.id) ?? messages[0];
  return (
    <>
      <PageHeader title="Mailbox" description="Every message this installation sent through the local mail stand-in. With the hosted mail service, messages are delivered instead and do not appear here." />
      {!available ? (
        <Alert tone="warning" title="No local mailbox">
          The mail stand-in is not configured or not running; messages go to the hosted service.
        </Alert>
      ) : (
        <div className="grid gap-4 lg:grid-cols-[22rem_1fr]">
          <Card title={`Newest ${messages.length} of ${total}`}>
            <form className="mb-3 flex gap-2">
              <label className="sr-only" htmlFor="to">
                Recipient
              </label>
              <input id="to" name="to" defaultValue={params.to ?? ""} placeholder="Filter by recipient" className="w-full rounded-md border border-ink-200 px-3 py-2" />
              <button className="rounded-md border border-ink-200 px-3 font-semibold">Filter</button>
            </form>
            <ul className="max-h-[70vh] divide-y divide-ink-100 overflow-y-auto">
              {messages.map((m) => (
                <li key={m.id}>
                  <a href={`?id=${m.id}${params.to ? `&to=${encodeURIComponent(params.to)}` : ""}`} className={`block px-2 py-2 no-underline hover:bg-ink-50 ${selected?.id === m.id ? "bg-estuary-50" : ""}`}>
                    <span className="block truncate font-semibold text-ink-900">{m.subject}</span>
                    <span className="block truncate text-sm text-ink-600">
                      {m.to.join(", ")} · {new Date(m.created_at).toLocaleString("en-US", { timeZone: "UTC" })} UTC
                    </span>
                  </a>
                </li>
              ))}
            </ul>
          </Card>
          {selected ? (
            <Card title={selected.subject}>
              <dl className="mb-3 grid grid-cols-[5rem_1fr] gap-1 text-sm">
                <dt className="font-semibold">From</dt>
                <dd>{selected.from}</dd>
                <dt className="font-semibold">To</dt>
                <dd>{selected.to.join(", ")}</dd>
              </dl>
              {selected.html ? <iframe title="Message" sandbox="" srcDoc={selected.html} className="h-[60vh] w-full rounded border border-ink-200 bg-white" /> : null}
              {selected.text ? (
                <details className="mt-3">
                  <summary className="cursor-pointer font-semibold">Plain-text part</summary>
                  <pre className="mt-2 whitespace-pre-wrap text-sm">{selected.text}</pre>
                </details>
              ) : null}
            </Card>
          ) : null}
        </div>
      )}
    </>
  );
}

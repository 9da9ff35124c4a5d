import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { Card } from "@/components/ui/card";
import { homePathFor } from "@/lib/auth/guards";
import { getActor } from "@/lib/auth/session";
import { CodeForm } from "./_components/code-form";
import { LinkRequestForm } from "./_components/link-request-form";

export const metadata: Metadata = { title: "Property owners" };

export default async function OwnerAccessPage() {
  const actor = await getActor();
  if (actor) redirect(homePathFor(actor));
  return (
    <div className="space-y-6">
      <Card>
        <h1 className="mb-1 text-2xl">Property owners</h1>
        <p className="mb-5 text-ink-600">See each backflow assembly at your property, when its next test is due, its test history, and download compliance certificates.</p>
        <h2 className="mb-3 text-base">With a letter from the program</h2>
        <CodeForm />
      </Card>
      <Card>
        <h2 className="mb-1 text-base">With your e-mail address</h2>
        <p className="mb-4 text-sm text-ink-600">Each notice the program e-mails you has a button that signs you in. Lost it? Ask for a new link.</p>
        <LinkRequestForm />
      </Card>
      <p className="text-center text-sm text-ink-600">
        Have a password? <a href="/login">Sign in here</a>.
      </p>
    </div>
  );
}

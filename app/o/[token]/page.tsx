import type { Metadata } from "next";
import { Alert } from "@/components/ui/alert";
import { ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { inspectOwnerLink } from "@/lib/data/owner-access";
import { ContinueForm } from "./continue-form";

export const metadata: Metadata = { title: "Sign in from your notice", referrer: "no-referrer" };

/**
 * Opening the link only shows who it is for: the sign-in happens on the button (a POST), so a
 * mail scanner that fetches every link in a message cannot use it up.
 */
export default async function OwnerLinkPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const state = await inspectOwnerLink(token);
  if (!state.isUsable) {
    return (
      <Card>
        <h1 className="mb-3 text-2xl">This link no longer works</h1>
        <Alert tone="warning">This sign-in link has expired or was already used. Nothing was changed.</Alert>
        <p className="mt-4 text-ink-700">Each link works once. Ask for a new one with the e-mail address the program writes to, or use the account number and code printed on a letter from the program.</p>
        <ButtonLink href="/owner-access" className="mt-4 w-full" size="lg">
          Get a new link
        </ButtonLink>
      </Card>
    );
  }
  return (
    <Card>
      <h1 className="mb-1 text-2xl">{`Welcome, ${state.name}`}</h1>
      <p className="mb-5 text-ink-700">
        See the backflow assemblies at your properties{state.programNames.length ? ` with ${state.programNames.join(" and ")}` : ""}: where each stands, when it is due, its test history and its compliance certificates.
      </p>
      <ContinueForm token={token} />
      <p className="mt-4 text-sm text-ink-600">This link works once. Not you? Close this page: nothing happens.</p>
    </Card>
  );
}

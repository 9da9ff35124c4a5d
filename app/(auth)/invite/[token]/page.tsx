import type { Metadata } from "next";
import { SetPasswordForm } from "@/components/auth/set-password-form";
import { Alert } from "@/components/ui/alert";
import { Card } from "@/components/ui/card";
import { findUsableToken } from "@/lib/data/accounts";
import { finishInvitation } from "./actions";

export const metadata: Metadata = { title: "Set up your account", referrer: "no-referrer" };

export default async function InvitationPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const row = await findUsableToken(token, "invitation");
  return (
    <Card>
      <h1 className="mb-4 text-2xl">Set up your account</h1>
      {row ? (
        <>
          <p className="mb-4 text-ink-600">
            Welcome, {row.name}. Choose a password for {row.email}.
          </p>
          <SetPasswordForm token={token} action={finishInvitation} submitLabel="Set up my account" />
        </>
      ) : (
        <Alert tone="danger" title="This invitation cannot be used">
          It has expired or was already used. Ask the program office to send a new one.
        </Alert>
      )}
    </Card>
  );
}

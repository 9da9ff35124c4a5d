import type { Metadata } from "next";
import { SetPasswordForm } from "@/components/auth/set-password-form";
import { Alert } from "@/components/ui/alert";
import { Card } from "@/components/ui/card";
import { findUsableToken } from "@/lib/data/accounts";
import { chooseNewPassword } from "./actions";

export const metadata: Metadata = { title: "Choose a new password", referrer: "no-referrer" };

export default async function ResetPasswordPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const row = await findUsableToken(token, "password_reset");
  return (
    <Card>
      <h1 className="mb-4 text-2xl">Choose a new password</h1>
      {row ? (
        <>
          <p className="mb-4 text-ink-600">For {row.email}. Every other signed-in device will be signed out.</p>
          <SetPasswordForm token={token} action={chooseNewPassword} submitLabel="Save the new password" />
        </>
      ) : (
        <Alert tone="danger" title="This link cannot be used">
          It has expired or was already used. <a href="/forgot-password">Ask for a new link</a>.
        </Alert>
      )}
    </Card>
  );
}

import type { Metadata } from "next";
import { Card } from "@/components/ui/card";
import { ForgotPasswordForm } from "./forgot-password-form";

export const metadata: Metadata = { title: "Forgot password" };

export default function ForgotPasswordPage() {
  return (
    <Card>
      <h1 className="mb-1 text-2xl">Forgot your password?</h1>
      <p className="mb-5 text-ink-600">We will e-mail you a link to choose a new one.</p>
      <ForgotPasswordForm />
      <p className="mt-5 text-sm">
        <a href="/login">Back to sign in</a>
      </p>
    </Card>
  );
}

import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { Alert } from "@/components/ui/alert";
import { Card } from "@/components/ui/card";
import { homePathFor } from "@/lib/auth/guards";
import { safeNextPath } from "@/lib/auth/redirects";
import { getActor } from "@/lib/auth/session";
import { LoginForm } from "./_components/login-form";

export const metadata: Metadata = { title: "Sign in" };

export default async function LoginPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const params = await searchParams;
  const next = safeNextPath(params.next) ?? undefined;
  const actor = await getActor();
  if (actor) redirect(next ?? homePathFor(actor));
  return (
    <Card>
      <h1 className="mb-1 text-2xl">Sign in</h1>
      <p className="mb-5 text-ink-600">Testers, program staff and property owners sign in here.</p>
      {params.signedOut ? (
        <div className="mb-4">
          <Alert tone="success">You are signed out.</Alert>
        </div>
      ) : null}
      {params.reset ? (
        <div className="mb-4">
          <Alert tone="success">Your password is changed. Sign in with the new one.</Alert>
        </div>
      ) : null}
      <LoginForm next={next} />
      <div className="mt-5 flex flex-wrap justify-between gap-2 text-sm">
        <a href="/forgot-password">Forgot your password?</a>
        <a href="/register">Register as a certified tester</a>
      </div>
      <p className="mt-4 text-sm text-ink-600">
        Property owner with a letter from the program? <a href="/owner-access">Use your account number and code</a>.
      </p>
    </Card>
  );
}

import type { ReactNode } from "react";
import { Wordmark } from "@/components/ui/logo";

/** The public certificate check: no sign-in, nothing private. */
export default function VerifyLayout({ children }: { children: ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col items-center bg-gradient-to-b from-estuary-50 to-ink-50 px-4 py-10">
      <a href="/" className="mb-8 no-underline hover:no-underline" aria-label="Zoneward home">
        <Wordmark />
      </a>
      <main className="w-full max-w-xl">{children}</main>
      <footer className="mt-10 text-center text-sm text-ink-600">
        <a href="/verify">Check another certificate</a> · <a href="/testers">Find a certified tester</a>
      </footer>
    </div>
  );
}

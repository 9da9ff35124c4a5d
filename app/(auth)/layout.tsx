import type { ReactNode } from "react";
import { Wordmark } from "@/components/ui/logo";

export default function AuthLayout({ children }: { children: ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col items-center bg-gradient-to-b from-estuary-50 to-ink-50 px-4 py-10">
      <a href="/" className="mb-8 no-underline hover:no-underline" aria-label="Zoneward home">
        <Wordmark />
      </a>
      <main className="w-full max-w-md">{children}</main>
      <footer className="mt-10 text-center text-sm text-ink-600">
        <a href="/verify">Check a certificate</a> · <a href="/testers">Find a certified tester</a>
      </footer>
    </div>
  );
}

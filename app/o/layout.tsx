import type { ReactNode } from "react";
import { Wordmark } from "@/components/ui/logo";

/** The page a notice's sign-in link opens: the signed-out look of the sign-in pages. */
export default function OwnerLinkLayout({ children }: { children: ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col items-center bg-gradient-to-b from-estuary-50 to-ink-50 px-4 py-10">
      <a href="/" className="mb-8 no-underline hover:no-underline" aria-label="Zoneward home">
        <Wordmark />
      </a>
      <main className="w-full max-w-md">{children}</main>
    </div>
  );
}

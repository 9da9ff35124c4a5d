import type { ReactNode } from "react";
import { PortalHeader } from "@/components/portal/portal-header";
import { getActor } from "@/lib/auth/session";
import { programName } from "@/lib/data/programs";
import { signOut } from "../(auth)/login/actions";

// Not a guard: every page below checks the actor's permission itself.
export default async function PortalLayout({ children }: { children: ReactNode }) {
  const actor = await getActor();
  const program = actor?.programId ? await programName(actor.programId) : null;
  return (
    <div className="flex min-h-screen flex-col">
      {actor ? <PortalHeader role={actor.role} name={actor.name} programName={program} signOut={signOut} /> : null}
      <main id="main" className="mx-auto w-full max-w-7xl flex-1 px-4 py-6 sm:py-8">
        {children}
      </main>
      <footer className="no-print border-t border-ink-200 bg-white py-4 text-center text-xs text-ink-600">
        Zoneward grades field tests against published minimums. Local codes, the assembly maker&apos;s instructions and licensed practice govern.
      </footer>
    </div>
  );
}

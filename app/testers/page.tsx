import type { Metadata } from "next";
import { Card } from "@/components/ui/card";
import { Wordmark } from "@/components/ui/logo";
import { listPublicPrograms } from "@/lib/data/accounts";
import { listPublicTesters } from "@/lib/data/testers";

export const metadata: Metadata = { title: "Certified backflow testers", description: "Testers approved by the water programs, with a certification valid today." };
export const dynamic = "force-dynamic";

/**
 * The public roster owners use to find a tester: approved by a program and holding a
 * certification valid today. Name, company, phone and programs — never an e-mail address.
 */
export default async function PublicTestersPage({ searchParams }: { searchParams: Promise<{ program?: string; q?: string }> }) {
  const params = await searchParams;
  const programs = await listPublicPrograms();
  const program = programs.find((p) => String(p.id) === params.program);
  const q = (params.q ?? "").slice(0, 80);
  const testers = await listPublicTesters({ programId: program?.id, q });
  return (
    <div className="min-h-screen bg-ink-50">
      <header className="border-b border-ink-200 bg-white">
        <div className="mx-auto flex max-w-5xl items-center justify-between px-4 py-3">
          <a href="/" className="no-underline hover:no-underline">
            <Wordmark />
          </a>
          <a href="/login">Sign in</a>
        </div>
      </header>
      <main id="main" className="mx-auto max-w-5xl px-4 py-8">
        <h1>Certified backflow assembly testers</h1>
        <p className="mt-2 max-w-3xl text-ink-600">
          These testers are approved by the water program named beside them and hold a tester certification that is valid today. Call one to arrange your assembly&apos;s yearly test; the tester files the report with the program for you. The program does not recommend any tester over another.
        </p>
        <form className="mt-6 flex flex-wrap items-end gap-3" action="/testers">
          <div>
            <label htmlFor="program" className="block text-sm font-semibold text-ink-800">
              Water program
            </label>
            <select id="program" name="program" defaultValue={program ? String(program.id) : ""} className="mt-1 rounded-md border border-ink-200 bg-white px-3 py-2">
              <option value="">All programs</option>
              {programs.map((p) => (
                <option key={p.id} value={p.id}>
                  {p.name}
                </option>
              ))}
            </select>
          </div>
          <div>
            <label htmlFor="q" className="block text-sm font-semibold text-ink-800">
              Name or company
            </label>
            <input id="q" name="q" type="search" defaultValue={q} className="mt-1 rounded-md border border-ink-200 bg-white px-3 py-2" />
          </div>
          <button className="rounded-md bg-estuary-700 px-4 py-2 font-semibold text-white">Show</button>
        </form>
        <div className="mt-6">
          <Card title={`${testers.length} tester${testers.length === 1 ? "" : "s"}${program ? ` approved by ${program.name}` : ""}`}>
            {testers.length === 0 ? (
              <p className="text-ink-600">No tester matches.</p>
            ) : (
              <ul className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
                {testers.map((t) => (
                  <li key={`${t.name}-${t.phone}`} className="rounded-md border border-ink-200 p-3">
                    <p className="font-semibold text-ink-900">{t.name}</p>
                    {t.company ? <p className="text-sm text-ink-700">{t.company}</p> : null}
                    {t.phone ? (
                      <p className="mt-1">
                        <a href={`tel:${t.phone.replace(/[^0-9+]/g, "")}`} className="inline-flex min-h-11 items-center font-semibold">
                          {t.phone}
                        </a>
                      </p>
                    ) : null}
                    <p className="text-xs text-ink-600">Approved by {t.programs.join(", ")}</p>
                  </li>
                ))}
              </ul>
            )}
          </Card>
        </div>
        <p className="mt-6 text-xs text-ink-600">Testing and repairing an assembly means shutting off the water and opening spring-loaded, pressurised parts: leave it to a certified tester. Local codes and the assembly maker&apos;s instructions govern.</p>
      </main>
    </div>
  );
}

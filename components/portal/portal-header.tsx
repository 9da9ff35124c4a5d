import { LogoMark } from "@/components/ui/logo";
import type { Role } from "@/db/schema/users";
import { navItems, roleLabels } from "./nav-items";

interface PortalHeaderProps {
  role: Role;
  name: string;
  programName: string | null;
  signOut: () => Promise<void>;
}

export function PortalHeader({ role, name, programName, signOut }: PortalHeaderProps) {
  const items = navItems[role];
  return (
    <header className="no-print border-b border-estuary-900 bg-estuary-800 text-white">
      <div className="mx-auto flex max-w-7xl items-center gap-4 px-4 py-2.5">
        <a href="/" className="flex shrink-0 items-center gap-2 text-white no-underline hover:no-underline">
          <span className="rounded bg-white p-0.5">
            <LogoMark className="h-7 w-7" />
          </span>
          <span className="text-lg font-bold tracking-tight">Zoneward</span>
        </a>
        <nav aria-label="Main" className="hidden flex-1 md:block">
          <ul className="flex flex-wrap gap-1">
            {items.map((item) => (
              <li key={item.href}>
                <a href={item.href} className="rounded px-3 py-2 text-sm font-semibold text-estuary-50 no-underline hover:bg-estuary-700 hover:no-underline">
                  {item.label}
                </a>
              </li>
            ))}
          </ul>
        </nav>
        <div className="ml-auto hidden items-center gap-3 text-sm md:flex">
          <span className="text-right leading-tight">
            <span className="block font-semibold">{name}</span>
            <span className="block text-estuary-100">
              {roleLabels[role]}
              {programName ? ` · ${programName}` : ""}
            </span>
          </span>
          <form action={signOut}>
            <button type="submit" className="rounded border border-estuary-400 px-3 py-1.5 font-semibold hover:bg-estuary-700">
              Sign out
            </button>
          </form>
        </div>
        {/* Phones: a menu that works without JavaScript. */}
        <details className="relative ml-auto md:hidden">
          <summary className="flex min-h-11 cursor-pointer list-none items-center rounded border border-estuary-400 px-3 font-semibold">Menu</summary>
          <div className="absolute right-0 z-20 mt-2 w-64 rounded-md border border-ink-200 bg-white p-2 text-ink-900 shadow-lg">
            <p className="px-3 py-2 text-sm text-ink-600">
              {name} · {roleLabels[role]}
            </p>
            <ul>
              {items.map((item) => (
                <li key={item.href}>
                  <a href={item.href} className="block min-h-11 rounded px-3 py-2.5 font-semibold text-ink-900 no-underline hover:bg-ink-50">
                    {item.label}
                  </a>
                </li>
              ))}
            </ul>
            <form action={signOut} className="mt-1 border-t border-ink-100 pt-1">
              <button type="submit" className="block min-h-11 w-full rounded px-3 py-2.5 text-left font-semibold text-fail-700 hover:bg-fail-50">
                Sign out
              </button>
            </form>
          </div>
        </details>
      </div>
    </header>
  );
}

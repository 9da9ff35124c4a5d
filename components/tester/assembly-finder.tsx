"use client";

import { useEffect, useState } from "react";
import useSWR from "swr";
import { Alert } from "@/components/ui/alert";
import { Badge } from "@/components/ui/badge";
import { Button, ButtonLink } from "@/components/ui/button";
import type { AssemblySearchHit } from "@/lib/data/assemblies-search";
import { ProgramPicker, useChosenProgram, type ProgramChoice } from "./program-picker";

const TAGS_KEY = "zw:tags";
const matchWords = { serial: "serial", account: "account number", address: "address", site_name: "site name" } as const;

async function fetchJson<T>(url: string): Promise<T> {
  const response = await fetch(url);
  const body = (await response.json().catch(() => null)) as (T & { error?: string }) | null;
  if (!response.ok) throw new Error(body?.error ?? "The search did not answer; try again.");
  return body as T;
}

function useDebounced<T>(value: T, delayMs: number): T {
  const [debounced, setDebounced] = useState(value);
  useEffect(() => {
    const id = setTimeout(() => setDebounced(value), delayMs);
    return () => clearTimeout(id);
  }, [value, delayMs]);
  return debounced;
}

interface TagPick {
  id: number;
  label: string;
}

function readTagPicks(): TagPick[] {
  try {
    const parsed = JSON.parse(localStorage.getItem(TAGS_KEY) ?? "[]") as unknown;
    const isPick = (p: unknown): p is TagPick => typeof p === "object" && p !== null && typeof (p as TagPick).id === "number" && typeof (p as TagPick).label === "string";
    return Array.isArray(parsed) ? parsed.filter(isPick).slice(0, 60) : [];
  } catch {
    return [];
  }
}

/** Search as you type (serial, account number, street address, site name), start a test, or pick assemblies for a tag sheet. */
export function AssemblyFinder({ programs, isPickingTags, preferredProgram }: { programs: ProgramChoice[]; isPickingTags: boolean; preferredProgram?: number }) {
  const [chosen, choose] = useChosenProgram(programs, preferredProgram);
  const [query, setQuery] = useState("");
  const debounced = useDebounced(query.trim(), 250);
  const [tags, setTags] = useState<TagPick[]>([]);
  useEffect(() => setTags(readTagPicks()), []);
  const saveTags = (next: TagPick[]) => {
    setTags(next);
    try {
      localStorage.setItem(TAGS_KEY, JSON.stringify(next));
    } catch {
      /* kept for this page only */
    }
  };
  const key = chosen && debounced.length >= 2 ? `/api/assemblies/search?program=${chosen.id}&q=${encodeURIComponent(debounced)}` : null;
  const search = useSWR<{ hits: AssemblySearchHit[]; query: string }, Error>(key, fetchJson, { keepPreviousData: true, revalidateOnFocus: false });
  const { data, isLoading } = search;
  const error: Error | undefined = search.error;
  const hits = key ? (data?.hits ?? []) : [];

  return (
    <div className="space-y-4 pb-28">
      <ProgramPicker programs={programs} chosen={chosen} onChoose={choose} />
      {isPickingTags ? <Alert tone="info">Pick the assemblies to print tags for, then press “Print tags”. Each tag&apos;s QR code opens a new test for its assembly.</Alert> : null}
      <div>
        <label htmlFor="assembly-search" className="block text-base font-semibold">
          Serial number, street address or account number
        </label>
        <p id="assembly-search-hint" className="text-sm text-ink-600">
          Type the start of it: “WR86”, “873 Amber”, “QV1000”. At least two characters.
        </p>
        <input
          id="assembly-search"
          type="search"
          autoComplete="off"
          autoCapitalize="characters"
          spellCheck={false}
          enterKeyHint="search"
          disabled={!chosen}
          placeholder={chosen ? `Search ${chosen.shortName}` : "Pick the program first"}
          aria-describedby="assembly-search-hint"
          value={query}
          onChange={(e) => setQuery(e.target.value.slice(0, 60))}
          className="mt-2 block h-14 w-full rounded-md border-2 border-ink-200 bg-white px-4 text-xl shadow-sm focus:border-estuary-600 focus:outline-2 focus:outline-estuary-600 disabled:bg-ink-100"
        />
      </div>

      <div aria-live="polite" className="text-sm text-ink-600" data-testid="search-status">
        {!key ? null : error ? <span className="text-fail-700">{error.message}</span> : isLoading && !data ? "Searching…" : `${hits.length === 25 ? "The first 25" : hits.length} match${hits.length === 1 ? "" : "es"} for “${data?.query ?? debounced}”`}
      </div>

      <ul className="space-y-3" data-testid="search-results">
        {hits.map((hit) => {
          const isPicked = tags.some((t) => t.id === hit.id);
          return (
            <li key={hit.id} className="rounded-lg border border-ink-200 bg-white px-4 py-3 shadow-sm" data-assembly={hit.id}>
              <div className="flex flex-wrap items-start justify-between gap-2">
                <div className="min-w-0">
                  <p className="text-lg font-bold">
                    {hit.kind} · {hit.serial || "no serial"}
                  </p>
                  <p className="font-medium">
                    {hit.site.addressLine1}, {hit.site.city}
                  </p>
                  <p className="text-sm text-ink-600">
                    {hit.site.name} · account {hit.site.accountNumber} · {hit.location}
                  </p>
                  <p className="text-sm text-ink-600">{[hit.make, hit.model, hit.size].filter(Boolean).join(" · ")}</p>
                </div>
                <div className="flex flex-col items-end gap-1">
                  <Badge tone="muted">matched {matchWords[hit.matchedOn]}</Badge>
                  {hit.status === "awaiting_confirmation" ? <Badge tone="caution">Awaiting confirmation</Badge> : null}
                  {hit.repairDueOn ? <Badge tone="fail">Repair due {hit.repairDueOn}</Badge> : hit.nextDueOn ? <Badge tone="brand">Due {hit.nextDueOn}</Badge> : <Badge tone="neutral">Never tested</Badge>}
                </div>
              </div>
              <div className="mt-3 flex flex-wrap gap-2">
                <ButtonLink href={`/tester/reports/new?assembly=${hit.id}`} size="lg" className="flex-1 sm:flex-none">
                  Start a test
                </ButtonLink>
                <Button
                  variant="secondary"
                  size="lg"
                  aria-pressed={isPicked}
                  onClick={() => saveTags(isPicked ? tags.filter((t) => t.id !== hit.id) : [...tags, { id: hit.id, label: `${hit.kind} ${hit.serial} · ${hit.site.addressLine1}` }].slice(0, 60))}
                >
                  {isPicked ? "✓ On the tag sheet" : "Add to tag sheet"}
                </Button>
              </div>
            </li>
          );
        })}
      </ul>
      {key && data && hits.length === 0 ? (
        <Alert tone="info" title="Not in the inventory?">
          Check the data plate and try the serial again, or the street number and name. A newly installed assembly can be registered from here.
        </Alert>
      ) : null}
      {chosen ? (
        <p>
          <a href={`/tester/assemblies/new?program=${chosen.id}`} className="font-semibold">
            Register a newly installed assembly
          </a>
        </p>
      ) : null}

      {tags.length ? (
        <div className="fixed inset-x-0 bottom-0 z-10 border-t border-ink-200 bg-white/95 px-4 py-3 shadow-2xl backdrop-blur">
          <div className="mx-auto flex max-w-7xl flex-wrap items-center justify-between gap-2">
            <p className="text-sm font-semibold" data-testid="tag-count">
              {tags.length} assembl{tags.length === 1 ? "y" : "ies"} on the tag sheet
            </p>
            <div className="flex gap-2">
              <Button variant="ghost" onClick={() => saveTags([])}>
                Clear
              </Button>
              <ButtonLink href={`/api/assemblies/tags?ids=${tags.map((t) => t.id).join(",")}`} target="_blank" rel="noopener" size="lg">
                Print tags
              </ButtonLink>
            </div>
          </div>
        </div>
      ) : null}
    </div>
  );
}

"use client";

import { useEffect, useState } from "react";

export interface ProgramChoice {
  id: number;
  name: string;
  shortName: string;
  units: "psid" | "kPa";
}

const STORAGE_KEY = "zw:program";

/**
 * The program the tester works in right now. With one approved program it is simply that one;
 * with several the tester picks first (remembered on this phone).
 */
export function useChosenProgram(programs: ProgramChoice[], preferred?: number): [ProgramChoice | null, (id: number) => void] {
  const only = programs.length === 1 ? programs[0]! : null;
  const [chosenId, setChosenId] = useState<number | null>(only?.id ?? (preferred && programs.some((p) => p.id === preferred) ? preferred : null));
  useEffect(() => {
    if (only || chosenId !== null) return;
    try {
      const saved = Number(localStorage.getItem(STORAGE_KEY));
      if (programs.some((p) => p.id === saved)) setChosenId(saved);
    } catch {
      /* no storage: the tester picks each time */
    }
  }, [only, chosenId, programs]);
  const choose = (id: number) => {
    setChosenId(id);
    try {
      localStorage.setItem(STORAGE_KEY, String(id));
    } catch {
      /* not remembered */
    }
  };
  return [programs.find((p) => p.id === chosenId) ?? null, choose];
}

export function ProgramPicker({ programs, chosen, onChoose }: { programs: ProgramChoice[]; chosen: ProgramChoice | null; onChoose: (id: number) => void }) {
  if (programs.length < 2) return null;
  return (
    <fieldset className="rounded-lg border border-ink-200 bg-white px-4 py-3 shadow-sm">
      <legend className="px-1 text-sm font-semibold text-ink-800">Which program are you testing for?</legend>
      <div className="mt-1 grid gap-2 sm:grid-cols-2">
        {programs.map((program) => (
          <button
            key={program.id}
            type="button"
            role="radio"
            aria-checked={chosen?.id === program.id}
            onClick={() => onChoose(program.id)}
            className={`min-h-12 rounded-md border-2 px-3 py-2 text-left font-semibold ${chosen?.id === program.id ? "border-estuary-700 bg-estuary-50 text-estuary-900" : "border-ink-200 bg-white text-ink-800 hover:bg-ink-50"}`}
          >
            {program.name}
            <span className="block text-xs font-normal text-ink-600">readings in {program.units}</span>
          </button>
        ))}
      </div>
    </fieldset>
  );
}

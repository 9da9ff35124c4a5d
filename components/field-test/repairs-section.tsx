"use client";

import { actionLabels, componentLabels, componentsFor, partLabels, partsByComponent, repairActions, repairCautions, type ComponentRepairDraft, type RepairComponent } from "@/lib/forms/repairs";
import type { AssemblyKind } from "@/lib/rules";

/** The usual cautions before opening a pressurised, spring-loaded assembly. */
export function SafetyCautions() {
  return (
    <div role="note" aria-labelledby="safety-title" className="rounded-md border-2 border-caution-600/40 bg-caution-50 px-4 py-3 text-caution-700">
      <p id="safety-title" className="font-bold">
        <span aria-hidden="true">⚠ </span>Before you open the assembly
      </p>
      <ul className="mt-2 list-disc space-y-1 pl-5 text-sm text-ink-800">
        {repairCautions.map((caution) => (
          <li key={caution}>{caution}</li>
        ))}
      </ul>
    </div>
  );
}

/** Which components were worked on and which parts were cleaned or replaced. */
export function RepairsEditor({ kind, repairs, errors, onChange }: { kind: AssemblyKind; repairs: ComponentRepairDraft[]; errors: Record<string, string>; onChange: (mutate: (repairs: ComponentRepairDraft[]) => void) => void }) {
  const components = componentsFor(kind);
  const entryFor = (component: RepairComponent) => repairs.find((r) => r.component === component);
  return (
    <div className="space-y-3">
      <fieldset>
        <legend className="text-base font-semibold text-ink-900">Components worked on</legend>
        <p className="text-sm text-ink-600">Pick each component you opened, then mark its parts.</p>
        <div className="mt-2 grid grid-cols-2 gap-2 sm:grid-cols-3">
          {components.map((component) => {
            const isOn = Boolean(entryFor(component));
            return (
              <button
                key={component}
                type="button"
                aria-pressed={isOn}
                onClick={() =>
                  onChange((list) => {
                    const index = list.findIndex((r) => r.component === component);
                    if (index >= 0) list.splice(index, 1);
                    else list.push({ component, parts: {}, note: "" });
                  })
                }
                className={`min-h-12 rounded-md border-2 px-3 py-2 text-left font-semibold ${isOn ? "border-estuary-700 bg-estuary-50 text-estuary-900" : "border-ink-200 bg-white text-ink-800 hover:bg-ink-50"}`}
              >
                <span aria-hidden="true">{isOn ? "☑ " : "☐ "}</span>
                {componentLabels[component]}
              </button>
            );
          })}
        </div>
        {errors.repairs ? (
          <p role="alert" className="mt-2 text-sm font-semibold text-fail-700">
            {errors.repairs}
          </p>
        ) : null}
      </fieldset>

      {repairs.map((entry) => {
        const error = errors[`repairs.${entry.component}`];
        const noteId = `repair-note-${entry.component}`;
        return (
          <fieldset key={entry.component} id={`repairs-${entry.component}`} className="rounded-md border border-ink-200 px-3 py-3 sm:px-4">
            <legend className="px-1 text-base font-bold text-estuary-800">{componentLabels[entry.component]}</legend>
            <ul className="divide-y divide-ink-100">
              {partsByComponent[entry.component].map((part) => {
                const action = entry.parts[part];
                return (
                  <li key={part} className="flex flex-wrap items-center justify-between gap-2 py-2">
                    <span className="font-medium">{partLabels[part]}</span>
                    <span className="flex gap-2" role="group" aria-label={`${componentLabels[entry.component]}: ${partLabels[part]}`}>
                      {repairActions.map((candidate) => (
                        <button
                          key={candidate}
                          type="button"
                          aria-pressed={action === candidate}
                          onClick={() =>
                            onChange((list) => {
                              const target = list.find((r) => r.component === entry.component);
                              if (!target) return;
                              if (target.parts[part] === candidate) delete target.parts[part];
                              else target.parts[part] = candidate;
                            })
                          }
                          className={`min-h-12 min-w-24 rounded-md border-2 px-3 py-2 text-sm font-semibold ${action === candidate ? "border-estuary-700 bg-estuary-700 text-white" : "border-ink-200 bg-white text-ink-800 hover:bg-ink-50"}`}
                        >
                          {actionLabels[candidate]}
                        </button>
                      ))}
                    </span>
                  </li>
                );
              })}
            </ul>
            <label htmlFor={noteId} className="mt-2 block text-sm font-semibold text-ink-800">
              Note {entry.parts.other || entry.component === "other" ? <span className="text-fail-600">*</span> : <span className="font-normal text-ink-600">(optional)</span>}
            </label>
            <input
              id={noteId}
              type="text"
              maxLength={300}
              value={entry.note}
              placeholder={entry.parts.other || entry.component === "other" ? "Which part, and what was done" : "e.g. debris on the seat"}
              onChange={(event) => {
                const note = event.target.value;
                onChange((list) => {
                  const target = list.find((r) => r.component === entry.component);
                  if (target) target.note = note;
                });
              }}
              className="mt-1 block min-h-12 w-full rounded-md border border-ink-200 px-3 py-2 text-base"
            />
            {error ? (
              <p role="alert" className="mt-1 text-sm font-semibold text-fail-700">
                {error}
              </p>
            ) : null}
          </fieldset>
        );
      })}
    </div>
  );
}

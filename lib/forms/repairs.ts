// Repairs recorded on a field test: which components a kind has, which parts each is rebuilt
// with, and the form's grouped shape ↔ one row per part as the report keeps them. Pure.
import { familyOf, type AssemblyKind } from "@/lib/rules";

export const repairComponents = ["check1", "check2", "relief_valve", "air_inlet", "check", "shutoff1", "shutoff2", "other"] as const;
export type RepairComponent = (typeof repairComponents)[number];
export const repairParts = ["disc_rubber", "spring", "seat", "seat_o_ring", "cover_o_ring", "diaphragm", "relief_disc", "guide", "other"] as const;
export type RepairPart = (typeof repairParts)[number];
export const repairActions = ["cleaned", "replaced"] as const;
export type RepairAction = (typeof repairActions)[number];

export const componentLabels: Readonly<Record<RepairComponent, string>> = Object.freeze({
  check1: "Check #1",
  check2: "Check #2",
  relief_valve: "Relief valve",
  air_inlet: "Air inlet",
  check: "Check valve",
  shutoff1: "No. 1 shutoff valve",
  shutoff2: "No. 2 shutoff valve",
  other: "Other",
});

export const partLabels: Readonly<Record<RepairPart, string>> = Object.freeze({
  disc_rubber: "Disc rubber",
  spring: "Spring",
  seat: "Seat",
  seat_o_ring: "Seat O-ring",
  cover_o_ring: "Cover O-ring",
  diaphragm: "Diaphragm",
  relief_disc: "Relief valve disc",
  guide: "Guide",
  other: "Other part",
});

export const actionLabels: Readonly<Record<RepairAction, string>> = Object.freeze({ cleaned: "Cleaned", replaced: "Replaced" });

const checkParts: readonly RepairPart[] = ["disc_rubber", "spring", "seat", "seat_o_ring", "cover_o_ring", "guide", "other"];
const shutoffParts: readonly RepairPart[] = ["seat", "seat_o_ring", "cover_o_ring", "other"];

/** Parts a component is rebuilt with (the usual repair-kit contents; the maker's parts list governs). */
export const partsByComponent: Readonly<Record<RepairComponent, readonly RepairPart[]>> = Object.freeze({
  check1: checkParts,
  check2: checkParts,
  check: checkParts,
  relief_valve: ["diaphragm", "relief_disc", "spring", "seat", "seat_o_ring", "cover_o_ring", "guide", "other"],
  air_inlet: ["disc_rubber", "spring", "seat", "cover_o_ring", "guide", "other"],
  shutoff1: shutoffParts,
  shutoff2: shutoffParts,
  other: ["other"],
});

/** The components of a kind, in the order a tester works through them. */
export function componentsFor(kind: AssemblyKind): RepairComponent[] {
  switch (familyOf(kind)) {
    case "rp":
      return ["check1", "check2", "relief_valve", "shutoff1", "shutoff2", "other"];
    case "dc":
      return ["check1", "check2", "shutoff1", "shutoff2", "other"];
    case "vb":
      return ["air_inlet", "check", "shutoff1", "shutoff2", "other"];
    case "ag":
      return ["other"];
  }
}

/** One component worked on, as the form holds it. */
export interface ComponentRepairDraft {
  component: RepairComponent;
  parts: Partial<Record<RepairPart, RepairAction>>;
  note: string;
}

/** One row per part, as the report stores and the API takes them. */
export interface RepairRow {
  component: RepairComponent;
  part: RepairPart;
  action: RepairAction;
  note: string;
}

/** Grouped form entries → rows. The component's note goes on its first row. */
export function repairRowsFromDraft(drafts: readonly ComponentRepairDraft[]): RepairRow[] {
  const rows: RepairRow[] = [];
  for (const draft of drafts) {
    let isFirst = true;
    for (const part of partsByComponent[draft.component]) {
      const action = draft.parts[part];
      if (!action) continue;
      rows.push({ component: draft.component, part, action, note: isFirst ? draft.note.trim() : "" });
      isFirst = false;
    }
  }
  return rows;
}

/** Rows back to grouped entries (to correct a returned report). */
export function repairDraftsFromRows(rows: readonly { component: string; part: string; action: string; note: string }[]): ComponentRepairDraft[] {
  const byComponent = new Map<RepairComponent, ComponentRepairDraft>();
  for (const row of rows) {
    const component = row.component as RepairComponent;
    const entry = byComponent.get(component) ?? { component, parts: {}, note: "" };
    entry.parts[row.part as RepairPart] = row.action as RepairAction;
    if (!entry.note && row.note) entry.note = row.note;
    byComponent.set(component, entry);
  }
  return [...byComponent.values()];
}

/** Problems with the repairs as entered, keyed by component ("" for the list as a whole). */
export function findRepairProblems(kind: AssemblyKind, drafts: readonly ComponentRepairDraft[]): Record<string, string> {
  const problems: Record<string, string> = {};
  const allowed = new Set(componentsFor(kind));
  const seen = new Set<RepairComponent>();
  for (const draft of drafts) {
    if (!allowed.has(draft.component)) problems[draft.component] = `A ${kind} has no ${componentLabels[draft.component] ?? draft.component}.`;
    else if (seen.has(draft.component)) problems[draft.component] = `${componentLabels[draft.component]} is listed twice.`;
    else if (!Object.values(draft.parts).some(Boolean)) problems[draft.component] = `Mark at least one part of ${componentLabels[draft.component]} as cleaned or replaced, or remove it.`;
    else if ((draft.parts.other || draft.component === "other") && draft.note.trim() === "") problems[draft.component] = "Say which part in the note.";
    else if (draft.note.length > 300) problems[draft.component] = "Keep the note under 300 characters.";
    seen.add(draft.component);
  }
  if (drafts.length === 0) problems[""] = "Record at least one part cleaned or replaced.";
  return problems;
}

/**
 * The usual cautions before opening an assembly. Shown where repairs are recorded; the grading
 * is a check against published minimums, not a licence to work on pressurised parts.
 */
export const repairCautions: readonly string[] = Object.freeze([
  "Shutting off the supply stops water to the building: tell the occupants first, and check that no process, boiler or fire service depends on it.",
  "Release trapped pressure through the test cocks before opening any cover, and keep your face away from the cover while it comes off.",
  "Covers and relief valves are spring-loaded: loosen cover bolts evenly and hold the cover until the spring is relaxed.",
  "Use the maker's repair parts and follow the maker's instructions for the assembly in hand.",
  "Local codes, the maker's instructions and licensed practice govern the repair; retest the assembly before returning it to service.",
]);

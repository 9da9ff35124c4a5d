// Plausible field-test readings for the demo (invented), psid, passing or failing in a
// realistic way. The grade always comes from lib/rules, never from the generator's intent.
import type { AssemblyKind, FieldTestInput } from "@/lib/rules";
import { psidToKpa } from "@/lib/rules";
import type { Random } from "./random";

export type FailureMode = "none" | "relief_low" | "relief_stuck" | "check1_low" | "check2_leak" | "check_low" | "air_inlet_low" | "air_inlet_partial" | "gap_short";

export function failureModeFor(kind: AssemblyKind, rng: Random): FailureMode {
  switch (kind) {
    case "RP":
    case "RPDA":
      return rng.weighted([["relief_low", 4], ["check1_low", 4], ["check2_leak", 3], ["relief_stuck", 1]] as const);
    case "DC":
    case "DCDA":
      return "check_low";
    case "PVB":
    case "SVB":
      return rng.weighted([["air_inlet_low", 3], ["air_inlet_partial", 2], ["check_low", 2]] as const);
    case "AG":
      return "gap_short";
  }
}

export function generateReadings(kind: AssemblyKind, mode: FailureMode, rng: Random): FieldTestInput {
  switch (kind) {
    case "RP":
    case "RPDA": {
      let relief: number | null = rng.decimal(2.4, 4.6);
      let check1 = Math.max(5.3, Math.round((relief + rng.decimal(2.2, 5.0)) * 10) / 10);
      let check2Tight = true;
      if (mode === "relief_low") relief = rng.decimal(1.1, 1.9);
      if (mode === "relief_stuck") relief = null;
      if (mode === "check1_low") {
        check1 = rng.decimal(3.6, 4.9);
        relief = Math.min(relief ?? 2.5, check1 - 0.8);
        relief = Math.round(Math.max(2.0, relief) * 10) / 10;
      }
      if (mode === "check2_leak") check2Tight = false;
      return { kind, reliefValveOpeningPoint: relief, check1Differential: check1, check1ClosedTight: true, check2ClosedTight: check2Tight, shutoff2Tight: true };
    }
    case "DC":
    case "DCDA": {
      const c1 = rng.decimal(1.6, 7.5);
      const c2 = rng.decimal(1.3, 6.5);
      if (mode === "check_low") {
        return rng.chance(0.5)
          ? { kind, check1Differential: rng.decimal(0.2, 0.9), check1ClosedTight: true, check2Differential: c2, check2ClosedTight: true, shutoff2Tight: true }
          : { kind, check1Differential: c1, check1ClosedTight: true, check2Differential: rng.decimal(0.2, 0.9), check2ClosedTight: rng.chance(0.7), shutoff2Tight: true };
      }
      return { kind, check1Differential: c1, check1ClosedTight: true, check2Differential: c2, check2ClosedTight: true, shutoff2Tight: true };
    }
    case "PVB":
    case "SVB": {
      let air: number | null = rng.decimal(1.2, 3.4);
      let fullyOpen = true;
      let check = rng.decimal(1.2, 4.2);
      if (mode === "air_inlet_low") air = rng.decimal(0.4, 0.9);
      if (mode === "air_inlet_partial") fullyOpen = false;
      if (mode === "check_low") check = rng.decimal(0.3, 0.9);
      return { kind, airInletOpeningPoint: air, airInletFullyOpen: fullyOpen, checkDifferential: check, checkClosedTight: true };
    }
    case "AG": {
      const d = rng.pick([0.5, 0.75, 1, 1.5, 2] as const);
      const nearSideWall = rng.chance(0.25);
      const needed = Math.max(nearSideWall ? 3 * d : 2 * d, nearSideWall ? 1.5 : 1);
      const gap = mode === "gap_short" ? Math.round(needed * rng.decimal(0.5, 0.9, 2) * 100) / 100 : Math.round(needed * rng.decimal(1.05, 2.2, 2) * 100) / 100;
      return { kind, supplyPipeDiameterInches: d, airGapInches: gap, nearSideWall };
    }
  }
}

const differentialKeys = ["reliefValveOpeningPoint", "check1Differential", "check2Differential", "airInletOpeningPoint", "checkDifferential"] as const;

/** The same readings written in kPa with one decimal, as a tester with a kPa gauge would. */
export function inKilopascals(input: FieldTestInput): FieldTestInput {
  const out: FieldTestInput = { ...input, unit: "kPa" };
  for (const key of differentialKeys) {
    const v = input[key];
    if (typeof v === "number") (out as unknown as Record<string, number>)[key] = Math.round(psidToKpa(v) * 10) / 10;
  }
  return out;
}

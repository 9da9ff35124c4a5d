// The field-test readings as lib/rules sees them ↔ one report_readings row. Pure.
import type { AssemblyKind, FieldTestInput } from "@/lib/rules";

export interface ReadingsRow {
  reliefOpening: number | null;
  reliefDidNotOpen: boolean | null;
  check1: number | null;
  check1Tight: boolean | null;
  check2: number | null;
  check2Tight: boolean | null;
  shutoff2Tight: boolean | null;
  airInletOpening: number | null;
  airInletDidNotOpen: boolean | null;
  airInletFullyOpen: boolean | null;
  checkDifferential: number | null;
  checkTight: boolean | null;
  airGapInches: number | null;
  pipeDiameterInches: number | null;
  nearSideWall: boolean | null;
}

const opt = <T>(value: T | undefined): T | null => (value === undefined ? null : value);

export function readingsRowFromInput(input: FieldTestInput): ReadingsRow {
  return {
    reliefOpening: input.reliefValveOpeningPoint ?? null,
    reliefDidNotOpen: input.reliefValveOpeningPoint === null ? true : input.reliefValveOpeningPoint === undefined ? null : false,
    check1: opt(input.check1Differential),
    check1Tight: opt(input.check1ClosedTight),
    check2: opt(input.check2Differential),
    check2Tight: opt(input.check2ClosedTight),
    shutoff2Tight: opt(input.shutoff2Tight),
    airInletOpening: input.airInletOpeningPoint ?? null,
    airInletDidNotOpen: input.airInletOpeningPoint === null ? true : input.airInletOpeningPoint === undefined ? null : false,
    airInletFullyOpen: opt(input.airInletFullyOpen),
    checkDifferential: opt(input.checkDifferential),
    checkTight: opt(input.checkClosedTight),
    airGapInches: opt(input.airGapInches),
    pipeDiameterInches: opt(input.supplyPipeDiameterInches),
    nearSideWall: opt(input.nearSideWall),
  };
}

/** Back to the grading input. A column left null is an unrecorded reading (undefined). */
export function inputFromReadingsRow(kind: AssemblyKind, unit: "psid" | "kPa", row: Partial<ReadingsRow>): FieldTestInput {
  const input: FieldTestInput = { kind, unit };
  const num = (v: number | null | undefined) => (v === null || v === undefined ? undefined : Number(v));
  const bool = (v: boolean | number | null | undefined) => (v === null || v === undefined ? undefined : Boolean(v));
  if (row.reliefDidNotOpen) input.reliefValveOpeningPoint = null;
  else if (num(row.reliefOpening) !== undefined) input.reliefValveOpeningPoint = num(row.reliefOpening);
  if (num(row.check1) !== undefined) input.check1Differential = num(row.check1);
  if (bool(row.check1Tight) !== undefined) input.check1ClosedTight = bool(row.check1Tight);
  if (num(row.check2) !== undefined) input.check2Differential = num(row.check2);
  if (bool(row.check2Tight) !== undefined) input.check2ClosedTight = bool(row.check2Tight);
  if (bool(row.shutoff2Tight) !== undefined) input.shutoff2Tight = bool(row.shutoff2Tight);
  if (row.airInletDidNotOpen) input.airInletOpeningPoint = null;
  else if (num(row.airInletOpening) !== undefined) input.airInletOpeningPoint = num(row.airInletOpening);
  if (bool(row.airInletFullyOpen) !== undefined) input.airInletFullyOpen = bool(row.airInletFullyOpen);
  if (num(row.checkDifferential) !== undefined) input.checkDifferential = num(row.checkDifferential);
  if (bool(row.checkTight) !== undefined) input.checkClosedTight = bool(row.checkTight);
  if (num(row.airGapInches) !== undefined) input.airGapInches = num(row.airGapInches);
  if (num(row.pipeDiameterInches) !== undefined) input.supplyPipeDiameterInches = num(row.pipeDiameterInches);
  if (bool(row.nearSideWall) !== undefined) input.nearSideWall = bool(row.nearSideWall);
  return input;
}

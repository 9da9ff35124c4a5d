import type { ReadingUnit } from './units';

/** Assembly kinds as the trade names them (AG = air gap, inspected and measured, not gauge-tested). */
export type AssemblyKind = 'RP' | 'RPDA' | 'DC' | 'DCDA' | 'PVB' | 'SVB' | 'AG';

/** Every kind, in the order forms and summaries list them. */
export const assemblyKinds: readonly AssemblyKind[] = Object.freeze(['RP', 'RPDA', 'DC', 'DCDA', 'PVB', 'SVB', 'AG'] as const);

/** Plain names of the kinds for screens and PDFs. */
export const assemblyKindLabels: Readonly<Record<AssemblyKind, string>> = Object.freeze({
  RP: 'Reduced pressure principle assembly',
  RPDA: 'Reduced pressure principle detector assembly',
  DC: 'Double check valve assembly',
  DCDA: 'Double check detector assembly',
  PVB: 'Pressure vacuum breaker',
  SVB: 'Spill-resistant vacuum breaker',
  AG: 'Air gap',
});

/** True for a known assembly kind (input from a form or a CSV import). */
export function isAssemblyKind(value: unknown): value is AssemblyKind {
  return value === 'RP' || value === 'RPDA' || value === 'DC' || value === 'DCDA' || value === 'PVB' || value === 'SVB' || value === 'AG';
}

/**
 * Kinds tested the same way: a detector assembly's main line is graded with its base kind's
 * minimums (RPDA as RP, DCDA as DC), and a PVB and an SVB record the same readings.
 */
export type KindFamily = 'rp' | 'dc' | 'vb' | 'ag';

/** The family whose procedure and minimums a kind follows. */
export function familyOf(kind: AssemblyKind): KindFamily {
  switch (kind) {
    case 'RP':
    case 'RPDA':
      return 'rp';
    case 'DC':
    case 'DCDA':
      return 'dc';
    case 'PVB':
    case 'SVB':
      return 'vb';
    case 'AG':
      return 'ag';
  }
}

/** What a field test records. Differential readings are in `unit` (psid unless said otherwise); air gap values in inches. */
export interface FieldTestInput {
  kind: AssemblyKind;
  /** Unit of the differential readings; default 'psid'. */
  unit?: ReadingUnit;
  /** RP/RPDA; null = the relief valve did not open. */
  reliefValveOpeningPoint?: number | null;
  /** RP, RPDA, DC, DCDA. */
  check1Differential?: number;
  check1ClosedTight?: boolean;
  /** DC, DCDA; RP only where the rule set asks for it (check #2 in the direction of flow). */
  check2Differential?: number;
  /** RP: held tight against backpressure. DC: closed tight. */
  check2ClosedTight?: boolean;
  /** No. 2 shutoff valve held (no-flow reached). */
  shutoff2Tight?: boolean;
  /** PVB/SVB; null = the air inlet did not open. */
  airInletOpeningPoint?: number | null;
  airInletFullyOpen?: boolean;
  checkDifferential?: number;
  checkClosedTight?: boolean;
  /** AG, inches. */
  supplyPipeDiameterInches?: number;
  airGapInches?: number;
  nearSideWall?: boolean;
}

/** A recorded field of a field test (what `missing` lists and what a form collects). */
export type FieldTestField = Exclude<keyof FieldTestInput, 'kind' | 'unit'>;

/** Labels of the recorded fields, for form inputs and "missing: …" messages. */
export const fieldLabels: Readonly<Record<FieldTestField, string>> = Object.freeze({
  reliefValveOpeningPoint: 'Relief valve opening point',
  check1Differential: 'Check #1 differential',
  check1ClosedTight: 'Check #1 closed tight',
  check2Differential: 'Check #2 differential',
  check2ClosedTight: 'Check #2 closed tight',
  shutoff2Tight: 'No. 2 shutoff valve tight',
  airInletOpeningPoint: 'Air inlet opening point',
  airInletFullyOpen: 'Air inlet opened fully',
  checkDifferential: 'Check valve differential',
  checkClosedTight: 'Check valve closed tight',
  supplyPipeDiameterInches: 'Supply pipe diameter (in.)',
  airGapInches: 'Air gap above flood-level rim (in.)',
  nearSideWall: 'Side wall near the opening',
});

/** Fields holding a differential pressure (checked against the gauge's range, converted from kPa). */
export const differentialFields: readonly FieldTestField[] = Object.freeze([
  'reliefValveOpeningPoint',
  'check1Differential',
  'check2Differential',
  'airInletOpeningPoint',
  'checkDifferential',
] as const);

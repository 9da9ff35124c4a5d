import type { AssemblyKind } from './field-test';

/** Degree of hazard the purveyor assigns to a service (severe > high health hazard > low hazard). */
export type Hazard = 'severe' | 'high' | 'low';

/** Every hazard class, most severe first. */
export const hazards: readonly Hazard[] = Object.freeze(['severe', 'high', 'low'] as const);

/** Plain names of the hazard classes. */
export const hazardLabels: Readonly<Record<Hazard, string>> = Object.freeze({
  severe: 'Severe health hazard',
  high: 'High health hazard',
  low: 'Low hazard',
});

/** True for a known hazard class. */
export function isHazard(value: unknown): value is Hazard {
  return value === 'severe' || value === 'high' || value === 'low';
}

const CONTAINMENT_SOURCE = 'Washington WAC 246-290-490(4)(b)';
const VACUUM_BREAKER_SOURCE = 'Texas 30 TAC §344.50(b)(3)–(4)';

/**
 * Kinds accepted for containment at the service connection, by hazard (Washington WAC
 * 246-290-490(4)(b)): high → air gap, RP or RPDA only; low → also DC or DCDA; severe → air gap,
 * or RP/RPDA with an in-plant air gap. PVB/SVB: backsiphonage only, never where backpressure is
 * possible (Texas 30 TAC §344.50(b)(3)–(4)); accepting them for a low hazard without
 * backpressure is common practice, not in the containment table [M].
 */
const kindsByHazard: Readonly<Record<Hazard, readonly AssemblyKind[]>> = Object.freeze({
  severe: Object.freeze(['AG', 'RP', 'RPDA'] as const),
  high: Object.freeze(['AG', 'RP', 'RPDA'] as const),
  low: Object.freeze(['AG', 'RP', 'RPDA', 'DC', 'DCDA', 'PVB', 'SVB'] as const),
});

const isVacuumBreaker = (kind: AssemblyKind) => kind === 'PVB' || kind === 'SVB';

/** Kinds that protect a service of this hazard (PVB/SVB dropped whenever backpressure is possible). */
export function allowedKinds(hazard: Hazard, backpressurePossible: boolean): AssemblyKind[] {
  return kindsByHazard[hazard].filter((kind) => !(backpressurePossible && isVacuumBreaker(kind)));
}

/** What is known about an assembly's placement, for the hazard check. */
export interface ProtectionCheck {
  hazard: Hazard;
  kind: AssemblyKind;
  /** undefined = not recorded: a vacuum breaker then gets a "confirm" warning. */
  backpressurePossible?: boolean;
  /** Severe hazard only: the in-plant air gap has been seen by the inspector. */
  inPlantAirGapConfirmed?: boolean;
}

/**
 * Warning sentences when an assembly's kind does not match its hazard (empty = no mismatch).
 * For the inventory and the review queue; the purveyor decides, these only point.
 */
export function protectionWarnings({ hazard, kind, backpressurePossible, inPlantAirGapConfirmed }: ProtectionCheck): string[] {
  const warnings: string[] = [];
  if (isVacuumBreaker(kind)) {
    if (backpressurePossible === true) {
      warnings.push(`A ${kind} protects against backsiphonage only and must never be used where backpressure is possible (${VACUUM_BREAKER_SOURCE}).`);
    } else if (backpressurePossible === undefined) {
      warnings.push(`Confirm that no backpressure is possible at this ${kind}: it protects against backsiphonage only (${VACUUM_BREAKER_SOURCE}).`);
    }
  }
  if (!kindsByHazard[hazard].includes(kind)) {
    const needed = hazard === 'low' ? 'an air gap, an RP, an RPDA, a DC or a DCDA' : 'an air gap, an RP or an RPDA';
    const extra = hazard === 'severe' ? ' (an RP or RPDA together with an in-plant air gap)' : '';
    warnings.push(`A ${kind} does not protect a ${hazard === 'low' ? 'low hazard' : `${hazard} health hazard`} at the service connection: it needs ${needed}${extra} (${CONTAINMENT_SOURCE}).`);
  } else if (hazard === 'severe' && (kind === 'RP' || kind === 'RPDA') && inPlantAirGapConfirmed !== true) {
    warnings.push(`For a severe health hazard an ${kind} is accepted only with an in-plant air gap: confirm the in-plant air gap (${CONTAINMENT_SOURCE}).`);
  }
  return warnings;
}

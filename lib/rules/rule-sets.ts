/**
 * Rule sets: the published field-test minimums as plain, JSON-serialisable data with an edition
 * id, so a program can store and adopt a local edition (stricter values, the buffer rule on)
 * without code changes. All pressures are psid, all air gap values inches.
 *
 * Rule sets are treated as immutable once in use: grading caches work per rule-set object, so a
 * changed edition must be a new object (the published ones are frozen).
 */

/** Stable ids of the grading rules (stored in findings; never rename one). */
export type RuleId =
  | 'rp.relief.min'
  | 'rp.check1.min'
  | 'rp.check1.tight'
  | 'rp.check1.exceedsRelief'
  | 'rp.buffer.min'
  | 'rp.check2.tight'
  | 'rp.check2.flow.min'
  | 'rp.shutoff2.tight'
  | 'dc.check1.min'
  | 'dc.check1.tight'
  | 'dc.check2.min'
  | 'dc.check2.tight'
  | 'dc.shutoff2.tight'
  | 'pvb.airInlet.min'
  | 'pvb.airInlet.fullyOpen'
  | 'pvb.check.min'
  | 'pvb.check.tight'
  | 'svb.airInlet.min'
  | 'svb.airInlet.fullyOpen'
  | 'svb.check.min'
  | 'svb.check.tight'
  | 'ag.gap.min'
  | 'ag.gap.sideWall.min';

/** Human labels of the rules, for the report screen and the PDF. */
export const ruleLabels: Readonly<Record<RuleId, string>> = Object.freeze({
  'rp.relief.min': 'Relief valve opening point',
  'rp.check1.min': 'Check #1 differential',
  'rp.check1.tight': 'Check #1 closed tight',
  'rp.check1.exceedsRelief': 'Check #1 greater than relief valve opening point',
  'rp.buffer.min': 'Check #1 minus relief valve opening point (buffer)',
  'rp.check2.tight': 'Check #2 tight against backpressure',
  'rp.check2.flow.min': 'Check #2 differential in the direction of flow',
  'rp.shutoff2.tight': 'No. 2 shutoff valve tight',
  'dc.check1.min': 'Check #1 differential',
  'dc.check1.tight': 'Check #1 closed tight',
  'dc.check2.min': 'Check #2 differential',
  'dc.check2.tight': 'Check #2 closed tight',
  'dc.shutoff2.tight': 'No. 2 shutoff valve tight',
  'pvb.airInlet.min': 'Air inlet opening point',
  'pvb.airInlet.fullyOpen': 'Air inlet opened fully',
  'pvb.check.min': 'Check valve differential',
  'pvb.check.tight': 'Check valve closed tight',
  'svb.airInlet.min': 'Air inlet opening point',
  'svb.airInlet.fullyOpen': 'Air inlet opened fully',
  'svb.check.min': 'Check valve differential',
  'svb.check.tight': 'Check valve closed tight',
  'ag.gap.min': 'Air gap above the flood-level rim',
  'ag.gap.sideWall.min': 'Air gap above the flood-level rim, side wall near',
});

/** Every rule id, in the order reports list them. */
export const ruleIds: readonly RuleId[] = Object.freeze(Object.keys(ruleLabels) as RuleId[]);

/** The label of a rule id (falls back to the id itself for an id from a newer release). */
export function labelOfRule(rule: string): string {
  return (ruleLabels as Record<string, string>)[rule] ?? rule;
}

/** Keys of a rule set's `sources` map: every rule, plus the two kit values. */
export type RuleSetSourceKey = RuleId | 'gauge.rangeMaxPsid' | 'kit.verificationMaxMonths';

/** Paths of the adjustable values of a rule set (what a variance names). */
export type RuleSetValuePath =
  | 'rp.reliefMin'
  | 'rp.check1Min'
  | 'rp.check1MustExceedRelief'
  | 'rp.bufferMin'
  | 'rp.check2FlowMin'
  | 'dc.check1Min'
  | 'dc.check2Min'
  | 'pvb.airInletMin'
  | 'pvb.checkMin'
  | 'svb.airInletMin'
  | 'svb.checkMin'
  | 'airGap.diameterFactor'
  | 'airGap.minInches'
  | 'airGap.sideWallFactor'
  | 'airGap.sideWallMinInches'
  | 'gauge.rangeMaxPsid'
  | 'kit.verificationMaxMonths';

/** A local value less strict than the published one, accepted only with the program's stated reason. */
export interface RuleSetVariance {
  path: RuleSetValuePath;
  reason: string;
}

/** A rule-set edition: minimums per kind family (RPDA uses rp, DCDA uses dc), kit limits, a source per rule. */
export interface RuleSet {
  /** Stable id stored with every graded report, e.g. 'published-current' or a program's 'quillmere-2025'. */
  edition: string;
  label: string;
  /** The published edition a local one derives from (null for a published edition). */
  basedOn: string | null;
  rp: {
    reliefMin: number;
    check1Min: number;
    check1MustExceedRelief: boolean;
    /** Minimum of check #1 minus relief opening point; null = rule off. */
    bufferMin: number | null;
    /** Minimum of check #2 in the direction of flow; null = not recorded. */
    check2FlowMin: number | null;
  };
  dc: { check1Min: number; check2Min: number };
  pvb: { airInletMin: number; checkMin: number };
  svb: { airInletMin: number; checkMin: number };
  airGap: { diameterFactor: number; minInches: number; sideWallFactor: number; sideWallMinInches: number };
  gauge: { rangeMaxPsid: number };
  kit: { verificationMaxMonths: number };
  sources: Record<RuleSetSourceKey, string>;
  variances?: RuleSetVariance[];
}

const EPA_2003 = 'EPA Cross-Connection Control Manual (EPA 816-R-03-002, 2003)';
const VB_FORMS = 'City PVB/SVB test form; public SVB one-hose test procedure';
const COMMON_PRACTICE_TIGHT = 'Common practice: test forms record whether the check closed tight [M]';

/** Sources of the published values, as the trade's public documents give them. */
const publishedSources: Readonly<Record<RuleSetSourceKey, string>> = Object.freeze({
  'rp.relief.min': `${EPA_2003}, ch. 5, Fig. 39; city RP test forms`,
  'rp.check1.min': `${EPA_2003}, Fig. 39, step 1`,
  'rp.check1.tight': COMMON_PRACTICE_TIGHT,
  'rp.check1.exceedsRelief':
    'USC Manual of Cross-Connection Control, 10th ed. criteria (via a public summary of the edition’s changes); Washington State Dept. of Health transition notice to 10th-edition criteria (2012)',
  'rp.buffer.min': 'USC Manual of Cross-Connection Control, 9th ed. (via a public summary); city and provincial RP test forms',
  'rp.check2.tight': `${EPA_2003}, Fig. 40`,
  'rp.check2.flow.min': 'A city RP test form; USC "Cross Talk" newsletter (1994), described as optional',
  'rp.shutoff2.tight': `${EPA_2003}: a leaking No. 2 shutoff means no-flow was not reached`,
  'dc.check1.min': `${EPA_2003}, Fig. 41; New England Water Works Assn. field test procedures (2010)`,
  'dc.check1.tight': COMMON_PRACTICE_TIGHT,
  'dc.check2.min': `${EPA_2003}, Fig. 41; New England Water Works Assn. field test procedures (2010)`,
  'dc.check2.tight': COMMON_PRACTICE_TIGHT,
  'dc.shutoff2.tight': `${EPA_2003}: a leaking No. 2 shutoff means no-flow was not reached`,
  'pvb.airInlet.min': VB_FORMS,
  'pvb.airInlet.fullyOpen': VB_FORMS,
  'pvb.check.min': VB_FORMS,
  'pvb.check.tight': COMMON_PRACTICE_TIGHT,
  'svb.airInlet.min': VB_FORMS,
  'svb.airInlet.fullyOpen': VB_FORMS,
  'svb.check.min': VB_FORMS,
  'svb.check.tight': COMMON_PRACTICE_TIGHT,
  'ag.gap.min': 'Washington WAC 246-290-010, "approved air gap"; Connecticut Regs. §19-13-B38a',
  'ag.gap.sideWall.min': 'Washington WAC 246-290-010, "approved air gap"',
  'gauge.rangeMaxPsid': 'Test-equipment trade article: differential gauges read 0–15 psid',
  'kit.verificationMaxMonths':
    'Texas city policy citing state practice; many local ordinances; Oregon OAR 333-061-0070(6) ("currently calibrated" gauge)',
});

function deepFreeze<T>(value: T): T {
  if (value && typeof value === 'object') {
    for (const inner of Object.values(value)) deepFreeze(inner);
    Object.freeze(value);
  }
  return value;
}

/**
 * The current published minimums: RP relief ≥ 2.0 and check #1 ≥ 5.0 and greater than the
 * relief point; DC checks ≥ 1.0; PVB/SVB air inlet and check ≥ 1.0; air gap 2 × d (≥ 1 in.),
 * 3 × d (≥ 1.5 in.) near a side wall; gauge range 15 psid; kit verified within 12 months.
 */
export const defaultRuleSet: RuleSet = deepFreeze<RuleSet>({
  edition: 'published-current',
  label: 'Published minimums, current criteria',
  basedOn: null,
  rp: { reliefMin: 2.0, check1Min: 5.0, check1MustExceedRelief: true, bufferMin: null, check2FlowMin: null },
  dc: { check1Min: 1.0, check2Min: 1.0 },
  pvb: { airInletMin: 1.0, checkMin: 1.0 },
  svb: { airInletMin: 1.0, checkMin: 1.0 },
  airGap: { diameterFactor: 2, minInches: 1, sideWallFactor: 3, sideWallMinInches: 1.5 },
  gauge: { rangeMaxPsid: 15 },
  kit: { verificationMaxMonths: 12 },
  sources: { ...publishedSources },
  variances: [],
});

/** The published minimums with the older 3.0 psid buffer (check #1 − relief opening point) switched on. */
export const bufferRuleSet: RuleSet = deepFreeze<RuleSet>({
  ...structuredCloneRuleSet(defaultRuleSet),
  edition: 'published-buffer-3',
  label: 'Published minimums with the 3.0 psid relief buffer (older-edition criteria)',
  rp: { ...defaultRuleSet.rp, bufferMin: 3.0 },
});

/** The published minimums plus the optional RP check #2 reading in the direction of flow (≥ 1.0 psid). */
export const check2FlowRuleSet: RuleSet = deepFreeze<RuleSet>({
  ...structuredCloneRuleSet(defaultRuleSet),
  edition: 'published-check2-flow',
  label: 'Published minimums with RP check #2 in the direction of flow (≥ 1.0 psid)',
  rp: { ...defaultRuleSet.rp, check2FlowMin: 1.0 },
});

/** The published editions a program can adopt as they are or base a local edition on. */
export const publishedRuleSets: readonly RuleSet[] = Object.freeze([defaultRuleSet, bufferRuleSet, check2FlowRuleSet]);

/** A published edition by its id (undefined for an unknown id; local editions live in the program's data). */
export function ruleSetById(edition: string): RuleSet | undefined {
  return publishedRuleSets.find((ruleSet) => ruleSet.edition === edition);
}

/** A mutable deep copy, to start a local edition from a published one. */
export function structuredCloneRuleSet(ruleSet: RuleSet): RuleSet {
  return JSON.parse(JSON.stringify(ruleSet)) as RuleSet;
}

/** One thing wrong with a candidate rule set. */
export interface RuleSetProblem {
  path: string;
  code: 'invalid' | 'missing_source' | 'less_strict_without_variance' | 'invalid_variance' | 'edition_taken';
  message: string;
}

type Strictness = 'higher_is_stricter' | 'lower_is_stricter' | 'nullable_minimum' | 'true_is_stricter';

interface ValueSpec {
  path: RuleSetValuePath;
  strictness: Strictness;
  kind: 'number' | 'integer' | 'boolean' | 'number_or_null';
  /** Values in psid that must fit on the gauge. */
  isPressure: boolean;
  /** Zero makes no sense for a multiplier or a range. */
  mustBePositive: boolean;
}

const valueSpecs: readonly ValueSpec[] = [
  { path: 'rp.reliefMin', strictness: 'higher_is_stricter', kind: 'number', isPressure: true, mustBePositive: false },
  { path: 'rp.check1Min', strictness: 'higher_is_stricter', kind: 'number', isPressure: true, mustBePositive: false },
  { path: 'rp.check1MustExceedRelief', strictness: 'true_is_stricter', kind: 'boolean', isPressure: false, mustBePositive: false },
  { path: 'rp.bufferMin', strictness: 'nullable_minimum', kind: 'number_or_null', isPressure: true, mustBePositive: false },
  { path: 'rp.check2FlowMin', strictness: 'nullable_minimum', kind: 'number_or_null', isPressure: true, mustBePositive: false },
  { path: 'dc.check1Min', strictness: 'higher_is_stricter', kind: 'number', isPressure: true, mustBePositive: false },
  { path: 'dc.check2Min', strictness: 'higher_is_stricter', kind: 'number', isPressure: true, mustBePositive: false },
  { path: 'pvb.airInletMin', strictness: 'higher_is_stricter', kind: 'number', isPressure: true, mustBePositive: false },
  { path: 'pvb.checkMin', strictness: 'higher_is_stricter', kind: 'number', isPressure: true, mustBePositive: false },
  { path: 'svb.airInletMin', strictness: 'higher_is_stricter', kind: 'number', isPressure: true, mustBePositive: false },
  { path: 'svb.checkMin', strictness: 'higher_is_stricter', kind: 'number', isPressure: true, mustBePositive: false },
  { path: 'airGap.diameterFactor', strictness: 'higher_is_stricter', kind: 'number', isPressure: false, mustBePositive: true },
  { path: 'airGap.minInches', strictness: 'higher_is_stricter', kind: 'number', isPressure: false, mustBePositive: false },
  { path: 'airGap.sideWallFactor', strictness: 'higher_is_stricter', kind: 'number', isPressure: false, mustBePositive: true },
  { path: 'airGap.sideWallMinInches', strictness: 'higher_is_stricter', kind: 'number', isPressure: false, mustBePositive: false },
  { path: 'gauge.rangeMaxPsid', strictness: 'lower_is_stricter', kind: 'number', isPressure: false, mustBePositive: true },
  { path: 'kit.verificationMaxMonths', strictness: 'lower_is_stricter', kind: 'integer', isPressure: false, mustBePositive: true },
];

/** Every adjustable value path (for an admin form listing what a variance may name). */
export const ruleSetValuePaths: readonly RuleSetValuePath[] = Object.freeze(valueSpecs.map((spec) => spec.path));

/** Reads a dotted path such as 'rp.reliefMin' out of a rule-set-shaped value. */
export function valueAtPath(ruleSet: unknown, path: string): unknown {
  let current: unknown = ruleSet;
  for (const key of path.split('.')) {
    if (current === null || typeof current !== 'object') return undefined;
    current = (current as Record<string, unknown>)[key];
  }
  return current;
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return value !== null && typeof value === 'object' && !Array.isArray(value);
}

/** Structural problems only (types, ranges, sources), without comparing against a base edition. */
export function findRuleSetShapeProblems(candidate: unknown): RuleSetProblem[] {
  const problems: RuleSetProblem[] = [];
  checkShape(candidate, problems);
  return problems;
}

function checkShape(candidate: unknown, problems: RuleSetProblem[]): void {
  if (!isRecord(candidate)) {
    problems.push({ path: '', code: 'invalid', message: 'A rule set must be an object.' });
    return;
  }
  if (typeof candidate.edition !== 'string' || candidate.edition.trim() === '') {
    problems.push({ path: 'edition', code: 'invalid', message: 'The edition id must be a non-empty string.' });
  }
  if (typeof candidate.label !== 'string' || candidate.label.trim() === '') {
    problems.push({ path: 'label', code: 'invalid', message: 'The label must be a non-empty string.' });
  }
  if (candidate.basedOn !== null && typeof candidate.basedOn !== 'string') {
    problems.push({ path: 'basedOn', code: 'invalid', message: 'basedOn must be an edition id or null.' });
  }
  const range = valueAtPath(candidate, 'gauge.rangeMaxPsid');
  const rangeMax = typeof range === 'number' && Number.isFinite(range) && range > 0 ? range : Infinity;
  for (const spec of valueSpecs) {
    const value = valueAtPath(candidate, spec.path);
    if (spec.kind === 'boolean') {
      if (typeof value !== 'boolean') problems.push({ path: spec.path, code: 'invalid', message: `${spec.path} must be true or false.` });
      continue;
    }
    if (value === null && spec.kind === 'number_or_null') continue;
    if (typeof value !== 'number' || !Number.isFinite(value) || value < 0) {
      problems.push({
        path: spec.path,
        code: 'invalid',
        message: `${spec.path} must be a finite number, zero or more${spec.kind === 'number_or_null' ? ', or null to switch the rule off' : ''}.`,
      });
      continue;
    }
    if (spec.mustBePositive && value === 0) problems.push({ path: spec.path, code: 'invalid', message: `${spec.path} must be greater than zero.` });
    if (spec.kind === 'integer' && !Number.isInteger(value)) problems.push({ path: spec.path, code: 'invalid', message: `${spec.path} must be a whole number.` });
    if (spec.isPressure && value > rangeMax) {
      problems.push({ path: spec.path, code: 'invalid', message: `${spec.path} (${value} psid) is above the gauge's ${rangeMax} psid range, so no reading could meet it.` });
    }
  }
  const relief = valueAtPath(candidate, 'rp.reliefMin');
  const buffer = valueAtPath(candidate, 'rp.bufferMin');
  if (typeof relief === 'number' && typeof buffer === 'number' && relief + buffer > rangeMax) {
    problems.push({ path: 'rp.bufferMin', code: 'invalid', message: `The relief minimum plus the buffer exceeds the gauge's ${rangeMax} psid range, so no RP could pass.` });
  }
  const sources = candidate.sources;
  for (const key of Object.keys(publishedSources) as RuleSetSourceKey[]) {
    const source = isRecord(sources) ? sources[key] : undefined;
    if (typeof source !== 'string' || source.trim() === '') {
      problems.push({ path: `sources.${key}`, code: 'missing_source', message: `Every rule needs its source: sources["${key}"] is missing or empty.` });
    }
  }
}

function isLessStrict(spec: ValueSpec, value: unknown, baseValue: unknown): boolean {
  switch (spec.strictness) {
    case 'higher_is_stricter':
      return (value as number) < (baseValue as number);
    case 'lower_is_stricter':
      return (value as number) > (baseValue as number);
    case 'true_is_stricter':
      return baseValue === true && value === false;
    case 'nullable_minimum':
      if (baseValue === null) return false;
      return value === null || (value as number) < (baseValue as number);
  }
}

/**
 * Problems with a candidate (e.g. a program's local edition read from the database) against the
 * published edition it derives from. Empty list = acceptable. Structure, ranges and a source for
 * every rule are checked; a value less strict than the base (a lower minimum, a rule switched
 * off, a longer kit interval, a wider gauge range) is accepted only when `variances` names its
 * path with a reason. Stricter values need no variance.
 */
export function validateRuleSet(candidate: unknown, base: RuleSet = defaultRuleSet): RuleSetProblem[] {
  const problems: RuleSetProblem[] = [];
  checkShape(candidate, problems);
  if (!isRecord(candidate)) return problems;

  const variances = candidate.variances ?? [];
  const reasonByPath = new Map<string, string>();
  if (!Array.isArray(variances)) {
    problems.push({ path: 'variances', code: 'invalid_variance', message: 'variances must be a list of { path, reason }.' });
  } else {
    variances.forEach((variance: unknown, index) => {
      const path = isRecord(variance) ? variance.path : undefined;
      const reason = isRecord(variance) ? variance.reason : undefined;
      if (typeof path !== 'string' || !ruleSetValuePaths.includes(path as RuleSetValuePath)) {
        problems.push({ path: `variances.${index}.path`, code: 'invalid_variance', message: `Variance ${index + 1} names ${JSON.stringify(path)}, which is not a rule-set value.` });
        return;
      }
      if (typeof reason !== 'string' || reason.trim() === '') {
        problems.push({ path: `variances.${index}.reason`, code: 'invalid_variance', message: `The variance for ${path} needs the program's reason.` });
        return;
      }
      reasonByPath.set(path, reason);
    });
  }

  for (const spec of valueSpecs) {
    const value = valueAtPath(candidate, spec.path);
    const baseValue = valueAtPath(base, spec.path);
    const isWellTyped = spec.kind === 'boolean' ? typeof value === 'boolean' : value === null || typeof value === 'number';
    if (!isWellTyped || !isLessStrict(spec, value, baseValue)) continue;
    if (!reasonByPath.has(spec.path)) {
      problems.push({
        path: spec.path,
        code: 'less_strict_without_variance',
        message: `${spec.path} is ${JSON.stringify(value)}, less strict than the ${base.edition} value ${JSON.stringify(baseValue)}: record it as a local variance with a reason, or keep the published value.`,
      });
    }
  }

  const published = typeof candidate.edition === 'string' ? ruleSetById(candidate.edition) : undefined;
  const differsFromPublished = published !== undefined && valueSpecs.some((spec) => valueAtPath(published, spec.path) !== valueAtPath(candidate, spec.path));
  if (published && differsFromPublished) {
    problems.push({ path: 'edition', code: 'edition_taken', message: `"${published.edition}" is a published edition's id: give the local edition its own id.` });
  }
  return problems;
}

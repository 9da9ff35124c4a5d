/**
 * Benchmark of the pure rules: grades per second on one core for a realistic mix of field
 * tests (target ≥ 1,000,000/s) and the notice plan for 150,000 assemblies (target ≤ 1 s), each
 * the median of 5 runs. `npx tsx bench/rules.ts` prints the figures; the overall benchmark
 * imports runRulesBench().
 */
import { realpathSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { performance } from 'node:perf_hooks';
import {
  addDays,
  deriveAssemblyFacts,
  gradeFieldTest,
  planNotices,
  psidToKpa,
  type AssemblyTestRecord,
  type FieldTestInput,
  type NoticeCandidate,
} from '../lib/rules';

export interface RulesBenchFigures {
  gradesPerSecond: number;
  gradesTarget: number;
  gradesMeetsTarget: boolean;
  noticePlanAssemblies: number;
  noticePlanMs: number;
  noticePlanTargetMs: number;
  noticePlanMeetsTarget: boolean;
  noticesPlanned: number;
  /** For information: deriving the stored facts of every assembly from its history. */
  factsPerSecond: number;
  runs: number;
}

const RUNS = 5;
const GRADES_TARGET = 1_000_000;
const NOTICE_ASSEMBLIES = 150_000;
const NOTICE_TARGET_MS = 1_000;
const TODAY = '2025-04-15';

/** Small deterministic generator (mulberry32) so every run grades the same mix. */
function createRandom(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const tenth = (value: number) => Math.round(value * 10) / 10;

/** A realistic mix: mostly RP and DC, a few vacuum breakers and air gaps, about one in eight failing, a few kPa forms. */
function buildGradeMix(size: number): FieldTestInput[] {
  const random = createRandom(20250415);
  const mix: FieldTestInput[] = [];
  for (let index = 0; index < size; index++) {
    const roll = random();
    const failing = random() < 0.12;
    let input: FieldTestInput;
    if (roll < 0.5) {
      const relief = tenth(failing ? 1.2 + random() * 0.9 : 2.0 + random() * 2.5);
      input = { kind: roll < 0.42 ? 'RP' : 'RPDA', reliefValveOpeningPoint: relief, check1Differential: tenth(5.0 + random() * 6), check1ClosedTight: true, check2ClosedTight: random() > 0.03, shutoff2Tight: random() > 0.01 };
    } else if (roll < 0.88) {
      input = { kind: roll < 0.78 ? 'DC' : 'DCDA', check1Differential: tenth(failing ? random() * 1.1 : 1.0 + random() * 6), check1ClosedTight: true, check2Differential: tenth(1.0 + random() * 6), shutoff2Tight: random() > 0.01 };
    } else if (roll < 0.98) {
      input = { kind: roll < 0.95 ? 'PVB' : 'SVB', airInletOpeningPoint: tenth(failing ? random() : 1.0 + random() * 3), airInletFullyOpen: true, checkDifferential: tenth(1.0 + random() * 4), checkClosedTight: true };
    } else {
      input = { kind: 'AG', supplyPipeDiameterInches: [0.5, 0.75, 1, 2][index % 4]!, airGapInches: tenth(1 + random() * 4), nearSideWall: random() < 0.2 };
    }
    if (input.kind !== 'AG' && random() < 0.05) {
      const inKpa: Record<string, unknown> = { ...input, unit: 'kPa' };
      for (const field of ['reliefValveOpeningPoint', 'check1Differential', 'check2Differential', 'airInletOpeningPoint', 'checkDifferential']) {
        const value = inKpa[field];
        if (typeof value === 'number') inKpa[field] = tenth(psidToKpa(value));
      }
      input = inKpa as unknown as FieldTestInput;
    }
    mix.push(input);
  }
  return mix;
}

function buildNoticeFleet(size: number): NoticeCandidate[] {
  const random = createRandom(150000);
  const fleet: NoticeCandidate[] = [];
  for (let index = 0; index < size; index++) {
    const roll = random();
    const nextDueOn = roll < 0.01 ? null : addDays(TODAY, Math.floor(random() * 500) - 130);
    if (roll > 0.97) fleet.push({ id: index + 1, baseState: 'inactive', nextDueOn: null, repairDueOn: null });
    else if (roll > 0.93) fleet.push({ id: index + 1, baseState: 'failed', nextDueOn, repairDueOn: addDays(TODAY, Math.floor(random() * 40) - 20) });
    else fleet.push({ id: index + 1, baseState: 'active', nextDueOn, repairDueOn: null, ownerHasEmail: random() > 0.05 });
  }
  return fleet;
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)]!;
}

function measureGrades(mix: readonly FieldTestInput[], grades: number): number {
  let failures = 0;
  const started = performance.now();
  for (let index = 0; index < grades; index++) {
    if (gradeFieldTest(mix[index & (mix.length - 1)]!).outcome === 'fail') failures++;
  }
  const elapsedMs = performance.now() - started;
  if (failures === 0) throw new Error('the mix should contain failing tests');
  return grades / (elapsedMs / 1000);
}

function measureFacts(histories: readonly AssemblyTestRecord[][]): number {
  const started = performance.now();
  let due = 0;
  for (const tests of histories) {
    if (deriveAssemblyFacts({ status: 'active', installedOn: '2015-06-01', hazard: 'high', tests }).nextDueOn !== null) due++;
  }
  const elapsedMs = performance.now() - started;
  if (due === 0) throw new Error('facts should have due dates');
  return histories.length / (elapsedMs / 1000);
}

/** Runs both benchmarks (median of 5 runs each) and returns the figures. */
export function runRulesBench(): RulesBenchFigures {
  const mix = buildGradeMix(4096);
  const gradesPerRun = 2_000_000;
  measureGrades(mix, 300_000); // warm-up: let the JIT settle before measuring
  const gradeRates: number[] = [];
  for (let run = 0; run < RUNS; run++) gradeRates.push(measureGrades(mix, gradesPerRun));

  const fleet = buildNoticeFleet(NOTICE_ASSEMBLIES);
  // Yesterday's batch ran: what it planned is already sent.
  const alreadySent = new Set(planNotices({ today: addDays(TODAY, -1), assemblies: fleet, alreadySent: new Set() }).map((notice) => notice.key));
  planNotices({ today: TODAY, assemblies: fleet, alreadySent }); // warm-up
  const planTimes: number[] = [];
  let noticesPlanned = 0;
  for (let run = 0; run < RUNS; run++) {
    const started = performance.now();
    noticesPlanned = planNotices({ today: TODAY, assemblies: fleet, alreadySent }).length;
    planTimes.push(performance.now() - started);
  }

  const random = createRandom(7);
  const histories = Array.from({ length: 20_000 }, () =>
    Array.from({ length: 10 }, (_, year): AssemblyTestRecord => ({ testedOn: addDays(`${2015 + year}-06-01`, Math.floor(random() * 60)), outcome: random() < 0.1 ? 'fail' : 'pass' })),
  );
  measureFacts(histories);
  const factRates: number[] = [];
  for (let run = 0; run < RUNS; run++) factRates.push(measureFacts(histories));

  const gradesPerSecond = Math.round(median(gradeRates));
  const noticePlanMs = Math.round(median(planTimes) * 10) / 10;
  return {
    gradesPerSecond,
    gradesTarget: GRADES_TARGET,
    gradesMeetsTarget: gradesPerSecond >= GRADES_TARGET,
    noticePlanAssemblies: NOTICE_ASSEMBLIES,
    noticePlanMs,
    noticePlanTargetMs: NOTICE_TARGET_MS,
    noticePlanMeetsTarget: noticePlanMs <= NOTICE_TARGET_MS,
    noticesPlanned,
    factsPerSecond: Math.round(median(factRates)),
    runs: RUNS,
  };
}

function printFigures(figures: RulesBenchFigures): void {
  const verdict = (isMet: boolean) => (isMet ? 'PASS' : 'MISS');
  console.log(`rules bench (median of ${figures.runs} runs, one core)`);
  console.log(`  grading:      ${figures.gradesPerSecond.toLocaleString('en-US')} grades/s   target ≥ ${figures.gradesTarget.toLocaleString('en-US')}/s   ${verdict(figures.gradesMeetsTarget)}`);
  console.log(`  notice plan:  ${figures.noticePlanMs} ms for ${figures.noticePlanAssemblies.toLocaleString('en-US')} assemblies (${figures.noticesPlanned.toLocaleString('en-US')} notices)   target ≤ ${figures.noticePlanTargetMs} ms   ${verdict(figures.noticePlanMeetsTarget)}`);
  console.log(`  facts:        ${figures.factsPerSecond.toLocaleString('en-US')} assemblies/s (10-test histories; no target)`);
}

const isRunDirectly = process.argv[1] !== undefined && realpathSync(process.argv[1]) === realpathSync(fileURLToPath(import.meta.url));
if (isRunDirectly) printFigures(runRulesBench());

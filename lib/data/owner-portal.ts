import "server-only";
import { and, desc, eq, inArray, isNull, ne } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { assemblies, certificates, notices, owners, programs, programSettings, reviews, siteOwners, sites, testReports, users } from "@/db/schema";
import { assertCan, type Actor } from "@/lib/auth/permissions";
import { InputError, isDuplicateKey, NotFoundError } from "@/lib/errors";
import { programRulesFromSettings, todayInZone } from "@/lib/programs/settings";
import { complianceStateLabels, complianceStateWithThresholds, complianceThresholds, type ComplianceState } from "@/lib/rules";
import { recordAudit } from "./audit";
import { emailSchema } from "./accounts";
import { checkWordFor, describeAssembly, formatLongDate, kindWithCode } from "./notices-format";
import { isPlaceholderEmail } from "./owner-access";

/**
 * The owner's portal: every site the signed-in owner speaks for (in any program), each
 * assembly's compliance state as lib/rules defines it on the program's own "today", its due
 * date and history, in plain words. An owner sees only sites linked to their account; any
 * other id is "not found".
 */

export type OwnerTone = "pass" | "fail" | "caution" | "neutral" | "muted";

const stateTone: Record<ComplianceState, OwnerTone> = {
  current: "pass",
  due_soon: "caution",
  overdue: "fail",
  failed_awaiting_repair: "caution",
  repair_overdue: "fail",
  never_tested: "caution",
  inactive: "muted",
};

export interface OwnerReportLine {
  id: number;
  reportNumber: string;
  testedOn: string;
  testedOnWords: string;
  testerName: string;
  testerCompany: string | null;
  /** "Passed", "Failed", "Failed, repaired on site and passed the retest". */
  resultWords: string;
  isPass: boolean;
  status: string;
  /** "Accepted on 4 March 2026", "Waiting for the program's review", … */
  statusWords: string;
  returnReasons: string[];
  certificateCode: string | null;
  reportPdfUrl: string;
}

export interface OwnerAssemblySummary {
  id: number;
  siteId: number;
  kind: string;
  kindLabel: string;
  description: string;
  location: string;
  serial: string;
  state: ComplianceState;
  stateLabel: string;
  tone: OwnerTone;
  /** One or two plain sentences: where it stands and what to do. */
  statement: string;
  /** A returned report or one waiting for review, in plain words (or null). */
  reportNote: string | null;
  /** "returned": a report of this assembly waits for the tester's correction; "waiting": for the program's review. */
  reportState: "returned" | "waiting" | null;
  needsAction: boolean;
  dueOn: string | null;
  dueOnWords: string | null;
  repairDueOnWords: string | null;
  lastTestedOnWords: string | null;
  currentCertificateCode: string | null;
}

export interface OwnerSite {
  id: number;
  name: string;
  addressLine1: string;
  city: string;
  accountNumber: string;
  programId: number;
  programName: string;
  programPhone: string;
  programEmail: string;
  assemblies: OwnerAssemblySummary[];
}

export interface OwnerOverview {
  sites: OwnerSite[];
  /** What needs doing, most urgent first. */
  actions: { assemblyId: number; tone: OwnerTone; text: string; note: string | null; siteName: string }[];
  counts: Record<ComplianceState, number>;
  /** The account was made for a printed letter and has no e-mail address yet. */
  needsEmail: boolean;
}

const urgency: Record<ComplianceState, number> = { repair_overdue: 0, overdue: 1, failed_awaiting_repair: 2, due_soon: 3, never_tested: 4, current: 5, inactive: 6 };

interface SiteRow {
  id: number;
  name: string;
  addressLine1: string;
  city: string;
  accountNumber: string;
  programId: number;
  programName: string;
  programPhone: string;
  programEmail: string;
  timezone: string;
  settings: typeof programSettings.$inferSelect;
}

async function ownerSites(actor: Actor, siteId?: number): Promise<SiteRow[]> {
  const rows = await getDb()
    .selectDistinct({
      id: sites.id,
      name: sites.name,
      addressLine1: sites.addressLine1,
      city: sites.city,
      accountNumber: sites.accountNumber,
      programId: programs.id,
      programName: programs.name,
      programPhone: programs.phone,
      programEmail: programs.replyToEmail,
      timezone: programs.timezone,
      settings: programSettings,
    })
    .from(owners)
    .innerJoin(siteOwners, eq(siteOwners.ownerId, owners.id))
    .innerJoin(sites, eq(sites.id, siteOwners.siteId))
    .innerJoin(programs, eq(programs.id, sites.programId))
    .innerJoin(programSettings, eq(programSettings.programId, programs.id))
    .where(siteId === undefined ? eq(owners.userId, actor.id) : and(eq(owners.userId, actor.id), eq(sites.id, siteId)))
    .orderBy(programs.name, sites.addressLine1);
  return [...new Map(rows.map((r) => [r.id, r])).values()];
}

type AssemblyRow = Pick<
  typeof assemblies.$inferSelect,
  "id" | "siteId" | "kind" | "make" | "model" | "size" | "serial" | "location" | "status" | "removedOn" | "baseState" | "lastTestedOn" | "lastOutcome" | "lastPassedOn" | "nextDueOn" | "repairDueOn" | "installedOn"
>;

const assemblyColumns = {
  id: assemblies.id,
  siteId: assemblies.siteId,
  kind: assemblies.kind,
  make: assemblies.make,
  model: assemblies.model,
  size: assemblies.size,
  serial: assemblies.serial,
  location: assemblies.location,
  status: assemblies.status,
  removedOn: assemblies.removedOn,
  baseState: assemblies.baseState,
  lastTestedOn: assemblies.lastTestedOn,
  lastOutcome: assemblies.lastOutcome,
  lastPassedOn: assemblies.lastPassedOn,
  nextDueOn: assemblies.nextDueOn,
  repairDueOn: assemblies.repairDueOn,
  installedOn: assemblies.installedOn,
};

interface ReportRow {
  id: number;
  assemblyId: number;
  reportNumber: string;
  status: string;
  testedOn: string;
  initialOutcome: string;
  finalOutcome: "pass" | "fail";
  wasRepaired: boolean;
  testerSnapshot: unknown;
  decidedAt: Date | null;
}

async function loadReports(assemblyIds: number[]): Promise<{ reports: ReportRow[]; reasons: Map<number, string[]>; certificatesByReport: Map<number, string> }> {
  if (assemblyIds.length === 0) return { reports: [], reasons: new Map(), certificatesByReport: new Map() };
  const db = getDb();
  // Superseded revisions were corrected by a newer one: the history shows the newest only.
  const reports = await db
    .select({
      id: testReports.id,
      assemblyId: testReports.assemblyId,
      reportNumber: testReports.reportNumber,
      status: testReports.status,
      testedOn: testReports.testedOn,
      initialOutcome: testReports.initialOutcome,
      finalOutcome: testReports.finalOutcome,
      wasRepaired: testReports.wasRepaired,
      testerSnapshot: testReports.testerSnapshot,
      decidedAt: testReports.decidedAt,
    })
    .from(testReports)
    .where(and(inArray(testReports.assemblyId, assemblyIds), ne(testReports.status, "superseded")))
    .orderBy(desc(testReports.testedOn), desc(testReports.id));
  const ids = reports.map((r) => r.id);
  const [reviewRows, certificateRows] = ids.length
    ? await Promise.all([
        db.select({ reportId: reviews.reportId, reasons: reviews.reasons }).from(reviews).where(and(inArray(reviews.reportId, ids), eq(reviews.decision, "returned"))),
        db.select({ reportId: certificates.reportId, code: certificates.code }).from(certificates).where(and(inArray(certificates.reportId, ids), isNull(certificates.supersededAt))),
      ])
    : [[], []];
  return {
    reports,
    reasons: new Map(reviewRows.map((r) => [r.reportId, Array.isArray(r.reasons) ? (r.reasons as unknown[]).map(String) : []])),
    certificatesByReport: new Map(certificateRows.map((c) => [c.reportId, c.code])),
  };
}

function testerOf(snapshot: unknown): { name: string; company: string | null } {
  const s = (snapshot ?? {}) as { name?: unknown; company?: unknown };
  return { name: typeof s.name === "string" && s.name ? s.name : "a certified tester", company: typeof s.company === "string" && s.company ? s.company : null };
}

function resultWordsOf(r: Pick<ReportRow, "initialOutcome" | "finalOutcome" | "wasRepaired">): string {
  if (r.finalOutcome === "pass") return r.initialOutcome === "pass" ? "Passed" : r.wasRepaired ? "Failed, repaired on site and passed the retest" : "Passed on retest";
  return r.wasRepaired ? "Failed, and failed again after a repair" : "Failed";
}

function statusWordsOf(r: ReportRow, reasons: string[], timezone: string): string {
  const day = (at: Date) => formatLongDate(todayInZone(timezone, at));
  switch (r.status) {
    case "accepted":
      return r.decidedAt ? `Accepted by the program on ${day(r.decidedAt)}` : "Accepted by the program";
    case "queued":
      return "Waiting for the program's review";
    case "awaiting_fee":
      return "Filed; waiting for the tester's filing fee before review";
    case "returned":
      return `Returned to the tester for correction${r.decidedAt ? ` on ${day(r.decidedAt)}` : ""}${reasons.length ? `: ${reasons.join("; ")}` : ""}`;
    default:
      return r.status;
  }
}

function toReportLine(r: ReportRow, reasons: Map<number, string[]>, certs: Map<number, string>, timezone: string): OwnerReportLine {
  const tester = testerOf(r.testerSnapshot);
  const returnReasons = reasons.get(r.id) ?? [];
  return {
    id: r.id,
    reportNumber: r.reportNumber,
    testedOn: r.testedOn,
    testedOnWords: formatLongDate(r.testedOn),
    testerName: tester.name,
    testerCompany: tester.company,
    resultWords: resultWordsOf(r),
    isPass: r.finalOutcome === "pass",
    status: r.status,
    statusWords: statusWordsOf(r, returnReasons, timezone),
    returnReasons,
    certificateCode: r.status === "accepted" && r.finalOutcome === "pass" ? (certs.get(r.id) ?? null) : null,
    reportPdfUrl: `/api/reports/${r.id}/pdf`,
  };
}

/** The plain-words statement of one assembly on the program's today. */
function summarize(a: AssemblyRow, thresholds: ReturnType<typeof complianceThresholds>, reports: OwnerReportLine[]): OwnerAssemblySummary {
  const state = complianceStateWithThresholds({ baseState: a.baseState, nextDueOn: a.nextDueOn, repairDueOn: a.repairDueOn, lastTestedOn: a.lastTestedOn, lastOutcome: a.lastOutcome, lastPassedOn: a.lastPassedOn }, thresholds);
  const words = (date: string | null) => (date ? formatLongDate(date) : null);
  const place = a.location.trim() ? `at the ${a.location.trim()}` : `(${kindWithCode(a.kind)})`;
  const check = checkWordFor(a.kind);
  let statement: string;
  switch (state) {
    case "current":
      statement = `Your assembly ${place} passed its ${check} on ${words(a.lastPassedOn) ?? words(a.lastTestedOn)}. The next yearly ${check} is due by ${words(a.nextDueOn)}.`;
      break;
    case "due_soon":
      statement = `Your assembly ${place} is due for its yearly ${check} by ${words(a.nextDueOn)}. Book a certified tester now.`;
      break;
    case "overdue":
      statement = `Your assembly ${place} is overdue: its yearly ${check} was due on ${words(a.nextDueOn)} and no passing ${check} is on file. Have it tested as soon as possible.`;
      break;
    case "failed_awaiting_repair":
      statement = `Your assembly ${place} failed on ${words(a.lastTestedOn)}; it must be repaired and retested by ${words(a.repairDueOn)}.`;
      break;
    case "repair_overdue":
      statement = `Your assembly ${place} failed on ${words(a.lastTestedOn)}; it had to be repaired and retested by ${words(a.repairDueOn)}, and that is now overdue. Have it repaired and retested at once.`;
      break;
    case "never_tested":
      statement = `No ${check} of your assembly ${place} is on file. Have a certified tester ${check === "test" ? "test" : "inspect"} it.`;
      break;
    case "inactive":
      statement =
        a.status === "awaiting_confirmation"
          ? `A tester registered this assembly ${place}; the program is confirming it.`
          : a.status === "replaced"
            ? `This assembly ${place} was replaced and is no longer in service.`
            : `This assembly ${place} was taken out of service${a.removedOn ? ` on ${formatLongDate(a.removedOn)}` : ""}.`;
      break;
  }
  const returned = reports.find((r) => r.status === "returned");
  const waiting = reports.find((r) => r.status === "queued" || r.status === "awaiting_fee");
  let reportNote: string | null = null;
  if (returned) reportNote = `The report of the ${check} on ${returned.testedOnWords} was returned to the tester for correction${returned.returnReasons.length ? ` (${returned.returnReasons.join("; ")})` : ""}. Until ${returned.testerName} corrects and resubmits it, that ${check} does not count: ask them to.`;
  else if (waiting) reportNote = `The report of the ${check} on ${waiting.testedOnWords} is waiting for the program's review.`;
  // A certificate proves compliance only while the assembly is in compliance: an overdue or
  // failed assembly's last certificate stays in its history, not offered as current.
  const isCompliant = state === "current" || state === "due_soon";
  const currentCertificate = isCompliant ? (reports.find((r) => r.certificateCode && r.testedOn === a.lastPassedOn) ?? null) : null;
  return {
    id: a.id,
    siteId: a.siteId,
    kind: a.kind,
    kindLabel: kindWithCode(a.kind),
    description: describeAssembly(a),
    location: a.location.trim() || "location not recorded",
    serial: a.serial,
    state,
    stateLabel: complianceStateLabels[state],
    tone: returned && state !== "overdue" && state !== "repair_overdue" ? "caution" : stateTone[state],
    statement,
    reportNote,
    reportState: returned ? "returned" : waiting ? "waiting" : null,
    needsAction: (state !== "current" && state !== "inactive") || Boolean(returned),
    dueOn: a.nextDueOn,
    dueOnWords: words(a.nextDueOn),
    repairDueOnWords: words(a.repairDueOn),
    lastTestedOnWords: words(a.lastTestedOn),
    currentCertificateCode: currentCertificate?.certificateCode ?? null,
  };
}

function thresholdsFor(site: SiteRow) {
  return complianceThresholds(todayInZone(site.timezone), programRulesFromSettings(site.settings));
}

/** Every site and assembly of the signed-in owner, with what needs doing first. */
export async function getOwnerOverview(actor: Actor): Promise<OwnerOverview> {
  assertCan(actor, "owner.portal");
  const siteRows = await ownerSites(actor);
  const assemblyRows = siteRows.length
    ? await getDb()
        .select(assemblyColumns)
        .from(assemblies)
        .where(inArray(assemblies.siteId, siteRows.map((s) => s.id)))
        .orderBy(assemblies.id)
    : [];
  const { reports, reasons, certificatesByReport } = await loadReports(assemblyRows.map((a) => a.id));
  const linesByAssembly = new Map<number, OwnerReportLine[]>();
  const zoneOfSite = new Map(siteRows.map((site) => [site.id, site.timezone]));
  const zoneOfAssembly = new Map(assemblyRows.map((a) => [a.id, zoneOfSite.get(a.siteId) ?? "UTC"]));
  for (const r of reports) linesByAssembly.set(r.assemblyId, [...(linesByAssembly.get(r.assemblyId) ?? []), toReportLine(r, reasons, certificatesByReport, zoneOfAssembly.get(r.assemblyId) ?? "UTC")]);
  const counts = Object.fromEntries(Object.keys(stateTone).map((k) => [k, 0])) as Record<ComplianceState, number>;
  const actions: OwnerOverview["actions"] = [];
  const out: OwnerSite[] = siteRows.map((site) => {
    const thresholds = thresholdsFor(site);
    const list = assemblyRows
      .filter((a) => a.siteId === site.id)
      .map((a) => summarize(a, thresholds, linesByAssembly.get(a.id) ?? []))
      .sort((x, y) => urgency[x.state] - urgency[y.state] || x.id - y.id);
    for (const a of list) {
      counts[a.state] += 1;
      if (!a.needsAction) continue;
      const isOnlyTheReport = a.reportState === "returned" && a.state === "current";
      actions.push({ assemblyId: a.id, tone: a.tone, text: isOnlyTheReport ? a.reportNote! : a.statement, note: !isOnlyTheReport && a.reportState === "returned" ? a.reportNote : null, siteName: `${site.name}, ${site.addressLine1}` });
    }
    return { id: site.id, name: site.name, addressLine1: site.addressLine1, city: site.city, accountNumber: site.accountNumber, programId: site.programId, programName: site.programName, programPhone: site.programPhone, programEmail: site.programEmail, assemblies: list };
  });
  const order = new Map(out.flatMap((s) => s.assemblies).map((a) => [a.id, urgency[a.state]]));
  actions.sort((x, y) => (order.get(x.assemblyId) ?? 9) - (order.get(y.assemblyId) ?? 9));
  return { sites: out, actions, counts, needsEmail: isPlaceholderEmail(actor.email) };
}

export interface OwnerAssemblyDetail {
  site: Omit<OwnerSite, "assemblies">;
  assembly: OwnerAssemblySummary & { make: string; model: string; size: string; installedOnWords: string | null };
  history: OwnerReportLine[];
  notices: { kind: string; kindWords: string; channelWords: string; onWords: string; statusWords: string }[];
}

const noticeKindWords: Record<string, string> = { reminder: "Reminder before the due date", overdue: "Overdue notice", final: "Final notice", repair_reminder: "Repair reminder" };

/** One assembly of the signed-in owner: its state, full test history and the notices sent about it. */
export async function getOwnerAssembly(actor: Actor, assemblyId: number): Promise<OwnerAssemblyDetail> {
  assertCan(actor, "owner.portal");
  const db = getDb();
  const [row] = await db.select(assemblyColumns).from(assemblies).where(eq(assemblies.id, assemblyId)).limit(1);
  if (!row) throw new NotFoundError("No such assembly among your sites.");
  const [site] = await ownerSites(actor, row.siteId);
  if (!site) throw new NotFoundError("No such assembly among your sites.");
  const { reports, reasons, certificatesByReport } = await loadReports([row.id]);
  const history = reports.map((r) => toReportLine(r, reasons, certificatesByReport, site.timezone));
  const summary = summarize(row, thresholdsFor(site), history);
  const noticeRows = await db
    .select({ kind: notices.kind, channel: notices.channel, status: notices.status, sentAt: notices.sentAt, plannedOn: notices.plannedOn })
    .from(notices)
    .where(and(eq(notices.assemblyId, row.id), inArray(notices.status, ["sent", "letter_ready", "letter_printed", "pending", "failed"])))
    .orderBy(desc(notices.id))
    .limit(30);
  return {
    site: { id: site.id, name: site.name, addressLine1: site.addressLine1, city: site.city, accountNumber: site.accountNumber, programId: site.programId, programName: site.programName, programPhone: site.programPhone, programEmail: site.programEmail },
    assembly: { ...summary, make: row.make, model: row.model, size: row.size, installedOnWords: row.installedOn ? formatLongDate(row.installedOn) : null },
    history,
    notices: noticeRows.map((n) => ({
      kind: n.kind,
      kindWords: noticeKindWords[n.kind] ?? n.kind,
      channelWords: n.channel === "email" ? "by e-mail" : "by post",
      onWords: formatLongDate(n.plannedOn),
      statusWords: n.status === "sent" ? "sent" : n.status === "letter_ready" || n.status === "letter_printed" ? "letter printed for posting" : "being sent",
    })),
  };
}

export const ownerContactSchema = z.object({ email: emailSchema });

/**
 * An owner who signed in with a letter's code adds an e-mail address: their account takes it
 * (so they can ask for a sign-in link), and their contact rows without one get it, so the
 * program's next notices arrive by e-mail. Audited per program.
 */
export async function addOwnerContactEmail(actor: Actor, input: z.infer<typeof ownerContactSchema>): Promise<void> {
  assertCan(actor, "owner.portal");
  if (!isPlaceholderEmail(actor.email)) throw new InputError("Your account already has an e-mail address. To change it, call the program office.");
  const db = getDb();
  const now = new Date();
  try {
    await db.transaction(async (tx) => {
      await tx.update(users).set({ email: input.email, updatedAt: now }).where(eq(users.id, actor.id));
      const rows = await tx.select({ id: owners.id, programId: owners.programId }).from(owners).where(and(eq(owners.userId, actor.id), isNull(owners.email)));
      if (rows.length) await tx.update(owners).set({ email: input.email, updatedAt: now }).where(inArray(owners.id, rows.map((r) => r.id)));
      for (const programId of new Set(rows.map((r) => r.programId))) {
        await recordAudit(tx, { programId, actorId: actor.id, action: "owner.contact_email_added", entityType: "user", entityId: actor.id, after: { email: input.email } });
      }
    });
  } catch (error) {
    if (isDuplicateKey(error)) throw new InputError("Another account already uses this e-mail address. Ask for a sign-in link with it instead.", { email: ["Another account already uses this address."] });
    throw error;
  }
}

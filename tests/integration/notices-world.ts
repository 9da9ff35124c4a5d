// A small invented program of its own for each notice test: sites, owners and assemblies whose
// stored facts put each one at a known notice stage today (dates a safe distance from every
// threshold, so the answer is the same a day either side). Demo data only.
import { eq, inArray } from "drizzle-orm";
import { assemblies, notices, owners, programs, programSettings, siteOwners, sites, users } from "@/db/schema";
import { todayInZone } from "@/lib/programs/settings";
import { addDays } from "@/lib/rules";
import { testDb } from "../helpers/db";
import { unique } from "../helpers/http";

export const WORLD_TIMEZONE = "Etc/GMT+6";

export interface WorldAssembly {
  id: number;
  siteId: number;
  label: string;
}

export interface NoticeWorld {
  programId: number;
  programName: string;
  slug: string;
  replyTo: string;
  today: string;
  tag: string;
  /** Every e-mail address of the world, to read the stand-in by recipient. */
  emails: string[];
  adminEmail: string;
  addSite(input: { name?: string; address?: string; city?: string; contacts: { name: string; email: string | null; receivesNotices?: boolean; ownerId?: number }[] }): Promise<{ siteId: number; accountNumber: string; ownerIds: number[] }>;
  addAssembly(siteId: number, facts: { label: string; kind?: "RP" | "DC" | "PVB" | "AG"; baseState?: "active" | "failed" | "inactive"; status?: "active" | "removed"; nextDueInDays?: number | null; repairDueInDays?: number; lastTestedDaysAgo?: number }): Promise<WorldAssembly>;
  email(name: string): string;
}

export async function createNoticeWorld(options: { phone?: string } = {}): Promise<NoticeWorld> {
  const db = testDb();
  const tag = unique("nw");
  const now = new Date();
  const slug = tag.slice(0, 40);
  const prefix = `Z${tag.slice(-5).toUpperCase()}`.slice(0, 6);
  const programName = `Quillmere Water Board ${tag.slice(-6)}`;
  const replyTo = `backflow@${tag}.example`;
  const [created] = await db
    .insert(programs)
    .values({ slug, name: programName, shortName: "Quillmere", reportPrefix: prefix, timezone: WORLD_TIMEZONE, contactEmail: `ccc@${tag}.example`, replyToEmail: replyTo, phone: options.phone ?? "(555) 017-4400", mailingAddress: "Cross-Connection Control, 9 Weir Street, Quillmere", createdAt: now })
    .$returningId();
  const programId = created!.id;
  await db.insert(programSettings).values({ programId, ruleSetEdition: "published-current", updatedAt: now });
  const adminEmail = `admin@${tag}.example`;
  await db.insert(users).values({ email: adminEmail, name: "Ottilie Brackwater", role: "admin", programId, status: "active", createdAt: now, updatedAt: now });
  const today = todayInZone(WORLD_TIMEZONE, now);
  const emails: string[] = [];
  let siteCount = 0;
  const world: NoticeWorld = {
    programId,
    programName,
    slug,
    replyTo,
    today,
    tag,
    emails,
    adminEmail,
    email(name) {
      const address = `${name}.${tag}@owners.example`.toLowerCase();
      if (!emails.includes(address)) emails.push(address);
      return address;
    },
    async addSite(input) {
      siteCount += 1;
      const accountNumber = `${prefix}${String(siteCount).padStart(5, "0")}`;
      const [site] = await db
        .insert(sites)
        .values({ programId, accountNumber, name: input.name ?? `Site ${siteCount}`, addressLine1: input.address ?? `${10 + siteCount} Quarry Lane`, city: input.city ?? "Quillmere", hazard: "high", createdAt: now, updatedAt: now })
        .$returningId();
      const ownerIds: number[] = [];
      for (const contact of input.contacts) {
        let ownerId = contact.ownerId;
        if (!ownerId) {
          const [owner] = await db.insert(owners).values({ programId, name: contact.name, email: contact.email, mailingAddress: `${20 + siteCount} Osier Row, Quillmere`, createdAt: now, updatedAt: now }).$returningId();
          ownerId = owner!.id;
        }
        ownerIds.push(ownerId);
        await db.insert(siteOwners).values({ siteId: site!.id, ownerId, relation: "owner", receivesNotices: contact.receivesNotices ?? true });
      }
      return { siteId: site!.id, accountNumber, ownerIds };
    },
    async addAssembly(siteId, facts) {
      const baseState = facts.baseState ?? "active";
      const nextDueOn = facts.nextDueInDays === null || facts.nextDueInDays === undefined ? null : addDays(today, facts.nextDueInDays);
      const [row] = await db
        .insert(assemblies)
        .values({
          programId,
          siteId,
          kind: facts.kind ?? "RP",
          make: "Tallowmere",
          model: "TR-4",
          size: "1 in",
          serial: `TA${Math.floor(Math.random() * 900000 + 100000)}`,
          location: facts.label,
          hazard: "high",
          installedOn: addDays(today, -2000),
          status: facts.status ?? "active",
          baseState,
          lastTestedOn: addDays(today, -(facts.lastTestedDaysAgo ?? 300)),
          lastOutcome: baseState === "failed" ? "fail" : "pass",
          lastPassedOn: baseState === "failed" ? addDays(today, -400) : addDays(today, -(facts.lastTestedDaysAgo ?? 300)),
          nextDueOn,
          repairDueOn: baseState === "failed" ? addDays(today, facts.repairDueInDays ?? 3) : null,
          createdAt: now,
          updatedAt: now,
        })
        .$returningId();
      return { id: row!.id, siteId, label: facts.label };
    },
  };
  return world;
}

/** Rows of the notices table for a world, by assembly. */
export async function noticeRowsOf(programId: number) {
  return testDb().select().from(notices).where(eq(notices.programId, programId));
}

export async function assemblyStages(ids: number[]) {
  return testDb().select({ id: assemblies.id, noticeStage: assemblies.noticeStage, noticeCycle: assemblies.noticeCycle }).from(assemblies).where(inArray(assemblies.id, ids));
}

/** Makes the program's settings say something else (e.g. a bad schedule). */
export async function setProgramSettings(programId: number, values: Partial<typeof programSettings.$inferInsert>) {
  await testDb().update(programSettings).set(values).where(eq(programSettings.programId, programId));
}

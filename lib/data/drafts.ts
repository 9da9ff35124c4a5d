import "server-only";
import { and, desc, eq, sql } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { assemblies, reportDrafts, sites } from "@/db/schema";
import { assertCan, type Actor } from "@/lib/auth/permissions";
import { InputError, isDuplicateKey, NotFoundError } from "@/lib/errors";
import type { FieldTestDraft } from "@/lib/forms/field-test-draft";
import { fieldTestDraftSchema } from "@/lib/forms/field-test-draft-schema";
import { requireApprovedProgram } from "./tester-programs";

export const draftSaveSchema = z.object({
  clientRevision: z.number({ message: "clientRevision must be a number." }).int().min(1).max(2_000_000_000),
  data: fieldTestDraftSchema,
});

export interface DraftSaveResult {
  /** The revision the server now holds for this key. */
  clientRevision: number;
  /** false when the server already held a newer (or the same) revision and kept it. */
  isStored: boolean;
  updatedAt: string;
}

/** Most unfinished tests a tester keeps on the server at once (a phone cannot flood the table). */
export const MAX_DRAFTS_PER_TESTER = 200;

/**
 * Stores a draft unless the server already has this or a newer revision of it, so a slow,
 * older request that arrives late changes nothing. The draft's assembly must be in a program
 * that approved the tester.
 */
export async function saveDraft(actor: Actor, clientKey: string, input: z.infer<typeof draftSaveSchema>): Promise<DraftSaveResult> {
  assertCan(actor, "reports.file");
  const db = getDb();
  const data: FieldTestDraft = input.data;
  const [assembly] = await db.select({ id: assemblies.id, programId: assemblies.programId, kind: assemblies.kind }).from(assemblies).where(eq(assemblies.id, data.assemblyId)).limit(1);
  if (!assembly) throw new NotFoundError("No such assembly in the programs you test for.");
  await requireApprovedProgram(actor, assembly.programId);
  if (assembly.kind !== data.kind) throw new InputError("The draft is for another kind of assembly; reload the form.", { "data.kind": ["The assembly's kind does not match."] });
  const [{ n } = { n: 0 }] = await db.select({ n: sql<number>`COUNT(*)` }).from(reportDrafts).where(eq(reportDrafts.testerId, actor.id));
  const now = new Date();
  const basedOnReportId = data.correctsReportId ?? data.amendsReportId ?? null;
  const values = { testerId: actor.id, clientKey, programId: assembly.programId, assemblyId: assembly.id, basedOnReportId, data, clientRevision: input.clientRevision, createdAt: now, updatedAt: now };
  if (Number(n) >= MAX_DRAFTS_PER_TESTER) {
    // At the limit only existing drafts may be updated.
    const [existing] = await db.select({ id: reportDrafts.id }).from(reportDrafts).where(and(eq(reportDrafts.testerId, actor.id), eq(reportDrafts.clientKey, clientKey))).limit(1);
    if (!existing) throw new InputError(`You have ${MAX_DRAFTS_PER_TESTER} unfinished tests saved: submit or discard some first.`);
  }
  const where = and(eq(reportDrafts.testerId, actor.id), eq(reportDrafts.clientKey, clientKey));
  const store = () =>
    db.transaction(async (tx) => {
      // The row lock makes "compare, then write" one step: two saves of one draft queue here.
      const [existing] = await tx.select({ clientRevision: reportDrafts.clientRevision, updatedAt: reportDrafts.updatedAt }).from(reportDrafts).where(where).for("update");
      if (!existing) {
        await tx.insert(reportDrafts).values(values);
        return { clientRevision: input.clientRevision, isStored: true, updatedAt: now.toISOString() };
      }
      if (existing.clientRevision >= input.clientRevision) return { clientRevision: existing.clientRevision, isStored: false, updatedAt: existing.updatedAt.toISOString() };
      await tx.update(reportDrafts).set({ programId: values.programId, assemblyId: values.assemblyId, basedOnReportId, data, clientRevision: input.clientRevision, updatedAt: now }).where(where);
      return { clientRevision: input.clientRevision, isStored: true, updatedAt: now.toISOString() };
    });
  try {
    return await store();
  } catch (error) {
    // Two first saves of a new draft at once: the loser finds the row and compares.
    if (isDuplicateKey(error)) return store();
    throw error;
  }
}

export interface DraftDto {
  clientKey: string;
  clientRevision: number;
  updatedAt: string;
  data: FieldTestDraft;
}

export async function getDraft(actor: Actor, clientKey: string): Promise<DraftDto> {
  assertCan(actor, "reports.file");
  const [row] = await getDb()
    .select({ clientKey: reportDrafts.clientKey, clientRevision: reportDrafts.clientRevision, updatedAt: reportDrafts.updatedAt, data: reportDrafts.data })
    .from(reportDrafts)
    .where(and(eq(reportDrafts.testerId, actor.id), eq(reportDrafts.clientKey, clientKey)))
    .limit(1);
  if (!row) throw new NotFoundError("No such draft.");
  return { ...row, updatedAt: row.updatedAt.toISOString(), data: row.data as FieldTestDraft };
}

export interface DraftSummary {
  clientKey: string;
  clientRevision: number;
  updatedAt: string;
  assemblyId: number | null;
  basedOnReportId: number | null;
  kind: string | null;
  serial: string | null;
  addressLine1: string | null;
  city: string | null;
  testedOn: string | null;
  correctsReportId: number | null;
  amendsReportId: number | null;
}

/** The tester's unfinished tests on the server, most recent first. */
export async function listDrafts(actor: Actor, filter: { assemblyId?: number } = {}): Promise<DraftSummary[]> {
  assertCan(actor, "reports.file");
  const rows = await getDb()
    .select({
      clientKey: reportDrafts.clientKey,
      clientRevision: reportDrafts.clientRevision,
      updatedAt: reportDrafts.updatedAt,
      assemblyId: reportDrafts.assemblyId,
      basedOnReportId: reportDrafts.basedOnReportId,
      data: reportDrafts.data,
      kind: assemblies.kind,
      serial: assemblies.serial,
      addressLine1: sites.addressLine1,
      city: sites.city,
    })
    .from(reportDrafts)
    .leftJoin(assemblies, eq(assemblies.id, reportDrafts.assemblyId))
    .leftJoin(sites, eq(sites.id, assemblies.siteId))
    .where(and(eq(reportDrafts.testerId, actor.id), filter.assemblyId ? eq(reportDrafts.assemblyId, filter.assemblyId) : undefined))
    .orderBy(desc(reportDrafts.updatedAt))
    .limit(MAX_DRAFTS_PER_TESTER);
  return rows.map(({ data, updatedAt, ...row }) => {
    const draft = (data ?? {}) as Partial<FieldTestDraft>;
    return { ...row, updatedAt: updatedAt.toISOString(), testedOn: draft.testedOn ?? null, correctsReportId: draft.correctsReportId ?? null, amendsReportId: draft.amendsReportId ?? null };
  });
}

/** Discards a draft. Discarding one that is already gone is not an error (another phone did it). */
export async function deleteDraft(actor: Actor, clientKey: string): Promise<{ isDeleted: boolean }> {
  assertCan(actor, "reports.file");
  const [result] = await getDb()
    .delete(reportDrafts)
    .where(and(eq(reportDrafts.testerId, actor.id), eq(reportDrafts.clientKey, clientKey)));
  return { isDeleted: (result as { affectedRows?: number }).affectedRows === 1 };
}

/** The tester's drafts for one assembly, with their data (the form resumes the fresher copy). */
export async function listDraftsForAssembly(actor: Actor, assemblyId: number): Promise<DraftDto[]> {
  assertCan(actor, "reports.file");
  const rows = await getDb()
    .select({ clientKey: reportDrafts.clientKey, clientRevision: reportDrafts.clientRevision, updatedAt: reportDrafts.updatedAt, data: reportDrafts.data })
    .from(reportDrafts)
    .where(and(eq(reportDrafts.testerId, actor.id), eq(reportDrafts.assemblyId, assemblyId)))
    .orderBy(desc(reportDrafts.updatedAt))
    .limit(20);
  return rows.map((row) => ({ ...row, updatedAt: row.updatedAt.toISOString(), data: row.data as FieldTestDraft }));
}

import "server-only";
import { and, desc, eq, isNull, sql } from "drizzle-orm";
import { z } from "zod";
import { getDb, type Executor } from "@/db/client";
import { attachments, certifications, testKits } from "@/db/schema";
import { assertCan, type Actor } from "@/lib/auth/permissions";
import { getEnv } from "@/lib/env";
import { ConflictError, InputError, isDuplicateKey, NotFoundError } from "@/lib/errors";
import { findCredentialWarnings, kitValidUntil, type CredentialWarning } from "@/lib/forms/credential-warnings";
import { isIsoDate } from "@/lib/rules";
import { recordAudit } from "./audit";
import { listApprovedPrograms, testerToday } from "./tester-programs";

export interface CertificationDto {
  id: number;
  certifyingBody: string;
  number: string;
  issuedOn: string | null;
  expiresOn: string;
  document: { id: number; name: string } | null;
  isCurrent: boolean;
}

export interface KitDto {
  id: number;
  make: string;
  model: string;
  serial: string;
  lastVerifiedOn: string;
  verificationResult: "passed" | "adjusted" | "failed";
  verifiedBy: string;
  validUntil: string;
  document: { id: number; name: string } | null;
  retiredAt: string | null;
}

export interface MyCredentials {
  today: string;
  certifications: CertificationDto[];
  kits: KitDto[];
  warnings: CredentialWarning[];
  uploadLimitBytes: number;
  /** The strictest kit interval among the programs that approved the tester (12 months by default). */
  verificationMaxMonths: number;
}

/** The strictest kit verification interval among the tester's programs (default 12 months). */
async function kitIntervalMonths(actor: Actor): Promise<number> {
  const programs = await listApprovedPrograms(actor);
  return programs.reduce((months, p) => Math.min(months, p.ruleSet.kit.verificationMaxMonths), 12);
}

/** The tester's certifications (newest first), kits (in use first) and what needs attention. */
export async function listMyCredentials(actor: Actor): Promise<MyCredentials> {
  assertCan(actor, "credentials.manage");
  const db = getDb();
  const [certRows, kitRows, today, months] = await Promise.all([
    db
      .select({ cert: certifications, documentName: attachments.originalName })
      .from(certifications)
      .leftJoin(attachments, eq(attachments.id, certifications.attachmentId))
      .where(eq(certifications.testerId, actor.id))
      .orderBy(desc(certifications.expiresOn), desc(certifications.id)),
    db
      .select({ kit: testKits, documentName: attachments.originalName })
      .from(testKits)
      .leftJoin(attachments, eq(attachments.id, testKits.attachmentId))
      .where(eq(testKits.testerId, actor.id))
      .orderBy(sql`${testKits.retiredAt} IS NOT NULL`, testKits.make, testKits.serial),
    testerToday(actor),
    kitIntervalMonths(actor),
  ]);
  const certs: CertificationDto[] = certRows.map(({ cert, documentName }, index) => ({
    id: cert.id,
    certifyingBody: cert.certifyingBody,
    number: cert.number,
    issuedOn: cert.issuedOn,
    expiresOn: cert.expiresOn,
    document: cert.attachmentId ? { id: cert.attachmentId, name: documentName ?? "document" } : null,
    isCurrent: index === 0,
  }));
  const kits: KitDto[] = kitRows.map(({ kit, documentName }) => ({
    id: kit.id,
    make: kit.make,
    model: kit.model,
    serial: kit.serial,
    lastVerifiedOn: kit.lastVerifiedOn,
    verificationResult: kit.verificationResult,
    verifiedBy: kit.verifiedBy,
    validUntil: kitValidUntil(kit.lastVerifiedOn, months),
    document: kit.attachmentId ? { id: kit.attachmentId, name: documentName ?? "document" } : null,
    retiredAt: kit.retiredAt ? kit.retiredAt.toISOString() : null,
  }));
  return {
    today,
    certifications: certs,
    kits,
    warnings: findCredentialWarnings({ certifications: certs, kits, today, verificationMaxMonths: months }),
    uploadLimitBytes: getEnv().UPLOAD_MAX_BYTES,
    verificationMaxMonths: months,
  };
}

const isoDate = (message: string) => z.string({ message }).refine(isIsoDate, { message });
const attachmentId = z.number().int().positive().nullable().default(null);

export const certificationSchema = z
  .object({
    certifyingBody: z.string().trim().min(2, { message: "Name the body that certified you." }).max(160),
    number: z.string().trim().min(1, { message: "Enter the certificate number." }).max(60),
    issuedOn: isoDate("Enter the issue date (YYYY-MM-DD).").nullable().default(null),
    expiresOn: isoDate("Enter the expiry date (YYYY-MM-DD)."),
    attachmentId,
  })
  .refine((c) => c.issuedOn === null || c.issuedOn <= c.expiresOn, { path: ["expiresOn"], message: "The expiry date is before the issue date." });

export const certificationUpdateSchema = z.object({ attachmentId: z.number().int().positive({ message: "Upload the document first." }) });

export const kitSchema = z.object({
  make: z.string().trim().min(1, { message: "Enter the kit's make." }).max(80),
  model: z.string().trim().min(1, { message: "Enter the kit's model." }).max(80),
  serial: z.string().trim().min(1, { message: "Enter the kit's serial number." }).max(60),
  lastVerifiedOn: isoDate("Enter the date of its last accuracy check (YYYY-MM-DD)."),
  verificationResult: z.enum(["passed", "adjusted", "failed"], { message: "Say how the accuracy check went." }).default("passed"),
  verifiedBy: z.string().trim().max(160).default(""),
  attachmentId,
});

export const kitVerificationSchema = z.object({
  verifiedOn: isoDate("Enter the date of the accuracy check (YYYY-MM-DD)."),
  result: z.enum(["passed", "adjusted", "failed"], { message: "Say how the accuracy check went." }),
  verifiedBy: z.string().trim().max(160).default(""),
  attachmentId,
});

/** The upload must be this tester's own, for this purpose, and not already on another record. */
async function checkAttachmentOrThrow(executor: Executor, actor: Actor, id: number | null, purpose: "certification" | "kit_verification"): Promise<void> {
  if (id === null) return;
  const [row] = await executor.select({ uploadedBy: attachments.uploadedBy, purpose: attachments.purpose }).from(attachments).where(eq(attachments.id, id)).limit(1);
  if (!row || row.uploadedBy !== actor.id) throw new InputError("That document was not found: upload it again.", { attachmentId: ["That document was not found: upload it again."] });
  if (row.purpose !== purpose) {
    const message = purpose === "certification" ? "That file was uploaded as a kit record, not a certificate." : "That file was uploaded as a certificate, not a kit record.";
    throw new InputError(message, { attachmentId: [message] });
  }
}

export async function addCertification(actor: Actor, input: z.infer<typeof certificationSchema>): Promise<{ id: number }> {
  assertCan(actor, "credentials.manage");
  const today = await testerToday(actor);
  if (input.expiresOn < today) throw new InputError(`That certification expired on ${input.expiresOn}: add the current one.`, { expiresOn: ["That date has passed: add your current certification."] });
  if (input.issuedOn && input.issuedOn > today) throw new InputError("The issue date is in the future.", { issuedOn: ["The issue date cannot be after today."] });
  return getDb().transaction(async (tx) => {
    await checkAttachmentOrThrow(tx, actor, input.attachmentId, "certification");
    const now = new Date();
    const [row] = await tx
      .insert(certifications)
      .values({ testerId: actor.id, certifyingBody: input.certifyingBody, number: input.number, issuedOn: input.issuedOn, expiresOn: input.expiresOn, attachmentId: input.attachmentId, createdAt: now, updatedAt: now })
      .$returningId();
    await recordAudit(tx, { actorId: actor.id, action: "certification.added", entityType: "certification", entityId: row!.id, after: input });
    return { id: row!.id };
  });
}

/** Attaches (or replaces) the uploaded copy of a certificate. */
export async function attachCertificationDocument(actor: Actor, certificationId: number, input: z.infer<typeof certificationUpdateSchema>): Promise<void> {
  assertCan(actor, "credentials.manage");
  await getDb().transaction(async (tx) => {
    const [cert] = await tx
      .select({ id: certifications.id, attachmentId: certifications.attachmentId })
      .from(certifications)
      .where(and(eq(certifications.id, certificationId), eq(certifications.testerId, actor.id)))
      .for("update");
    if (!cert) throw new NotFoundError("No such certification.");
    await checkAttachmentOrThrow(tx, actor, input.attachmentId, "certification");
    await tx.update(certifications).set({ attachmentId: input.attachmentId, updatedAt: new Date() }).where(eq(certifications.id, cert.id));
    await recordAudit(tx, { actorId: actor.id, action: "certification.document_attached", entityType: "certification", entityId: cert.id, before: { attachmentId: cert.attachmentId }, after: { attachmentId: input.attachmentId } });
  });
}

export async function addKit(actor: Actor, input: z.infer<typeof kitSchema>): Promise<{ id: number }> {
  assertCan(actor, "credentials.manage");
  const today = await testerToday(actor);
  if (input.lastVerifiedOn > today) throw new InputError("The accuracy check cannot be dated after today.", { lastVerifiedOn: ["The accuracy check cannot be dated after today."] });
  try {
    return await getDb().transaction(async (tx) => {
      await checkAttachmentOrThrow(tx, actor, input.attachmentId, "kit_verification");
      const now = new Date();
      const [existing] = await tx
        .select({ id: testKits.id, retiredAt: testKits.retiredAt })
        .from(testKits)
        .where(and(eq(testKits.testerId, actor.id), eq(testKits.serial, input.serial)))
        .for("update");
      if (existing && !existing.retiredAt) throw new ConflictError(`You already have a kit with serial ${input.serial}. Record a new accuracy check on it instead.`, "duplicate_serial");
      if (existing) {
        // A retired gauge back in service keeps its id, so older reports still point at it.
        await tx
          .update(testKits)
          .set({ make: input.make, model: input.model, lastVerifiedOn: input.lastVerifiedOn, verificationResult: input.verificationResult, verifiedBy: input.verifiedBy, attachmentId: input.attachmentId, retiredAt: null, updatedAt: now })
          .where(eq(testKits.id, existing.id));
        await recordAudit(tx, { actorId: actor.id, action: "kit.returned_to_service", entityType: "test_kit", entityId: existing.id, after: input });
        return { id: existing.id };
      }
      const [row] = await tx
        .insert(testKits)
        .values({ testerId: actor.id, make: input.make, model: input.model, serial: input.serial, lastVerifiedOn: input.lastVerifiedOn, verificationResult: input.verificationResult, verifiedBy: input.verifiedBy, attachmentId: input.attachmentId, createdAt: now, updatedAt: now })
        .$returningId();
      await recordAudit(tx, { actorId: actor.id, action: "kit.added", entityType: "test_kit", entityId: row!.id, after: input });
      return { id: row!.id };
    });
  } catch (error) {
    if (isDuplicateKey(error)) throw new ConflictError(`You already have a kit with serial ${input.serial}. Record a new accuracy check on it instead.`, "duplicate_serial");
    throw error;
  }
}

/** A new accuracy check of a kit: the date, the result, who did it and the record. */
export async function recordKitVerification(actor: Actor, kitId: number, input: z.infer<typeof kitVerificationSchema>): Promise<void> {
  assertCan(actor, "credentials.manage");
  const today = await testerToday(actor);
  if (input.verifiedOn > today) throw new InputError("The accuracy check cannot be dated after today.", { verifiedOn: ["The accuracy check cannot be dated after today."] });
  await getDb().transaction(async (tx) => {
    const [kit] = await tx
      .select()
      .from(testKits)
      .where(and(eq(testKits.id, kitId), eq(testKits.testerId, actor.id)))
      .for("update");
    if (!kit) throw new NotFoundError("No such test kit.");
    if (kit.retiredAt) throw new ConflictError("This kit is retired: add it again with the same serial to put it back in service.", "kit_retired");
    if (input.verifiedOn < kit.lastVerifiedOn) throw new InputError(`The kit's check on file (${kit.lastVerifiedOn}) is newer than this one.`, { verifiedOn: [`The check on file (${kit.lastVerifiedOn}) is newer than this date.`] });
    await checkAttachmentOrThrow(tx, actor, input.attachmentId, "kit_verification");
    await tx
      .update(testKits)
      .set({ lastVerifiedOn: input.verifiedOn, verificationResult: input.result, verifiedBy: input.verifiedBy, attachmentId: input.attachmentId, updatedAt: new Date() })
      .where(eq(testKits.id, kit.id));
    await recordAudit(tx, {
      actorId: actor.id,
      action: "kit.verified",
      entityType: "test_kit",
      entityId: kit.id,
      before: { lastVerifiedOn: kit.lastVerifiedOn, verificationResult: kit.verificationResult, verifiedBy: kit.verifiedBy, attachmentId: kit.attachmentId },
      after: input,
    });
  });
}

/** Takes a kit out of service; reports filed with it keep their snapshot of it. */
export async function retireKit(actor: Actor, kitId: number): Promise<void> {
  assertCan(actor, "credentials.manage");
  await getDb().transaction(async (tx) => {
    const [kit] = await tx
      .select({ id: testKits.id, retiredAt: testKits.retiredAt })
      .from(testKits)
      .where(and(eq(testKits.id, kitId), eq(testKits.testerId, actor.id)))
      .for("update");
    if (!kit) throw new NotFoundError("No such test kit.");
    if (kit.retiredAt) throw new ConflictError("This kit is already retired.", "kit_retired");
    const now = new Date();
    await tx.update(testKits).set({ retiredAt: now, updatedAt: now }).where(and(eq(testKits.id, kit.id), isNull(testKits.retiredAt)));
    await recordAudit(tx, { actorId: actor.id, action: "kit.retired", entityType: "test_kit", entityId: kit.id, after: { retiredAt: now.toISOString() } });
  });
}

import "server-only";
import { createHash } from "node:crypto";
import { and, eq, or } from "drizzle-orm";
import { getDb } from "@/db/client";
import { attachments, certifications, importJobs, testerApprovals, testKits } from "@/db/schema";
import type { Actor } from "@/lib/auth/permissions";
import { getEnv } from "@/lib/env";
import { AppError, InputError, NotFoundError } from "@/lib/errors";
import { getFileStore } from "@/lib/storage/file-store";
import { sniffFileType, type SniffedType } from "@/lib/storage/sniff";

export type AttachmentPurpose = (typeof attachments.$inferInsert)["purpose"];

/** Which sniffed types each purpose accepts. */
const allowedTypes: Record<AttachmentPurpose, SniffedType[]> = {
  certification: ["application/pdf", "image/png", "image/jpeg"],
  kit_verification: ["application/pdf", "image/png", "image/jpeg"],
  inventory_import: ["text/csv"],
  import_errors: ["text/csv"],
  other: ["application/pdf", "image/png", "image/jpeg"],
};

const typeWords: Record<SniffedType, string> = { "application/pdf": "PDF", "image/png": "PNG", "image/jpeg": "JPEG", "text/csv": "CSV" };

export interface SavedAttachment {
  id: number;
  originalName: string;
  contentType: string;
  sizeBytes: number;
}

/**
 * Stores an upload after checking its size and its real type (by content). The file is written
 * before the row, so a row always points at bytes; a failed insert removes the file again.
 */
export async function saveUpload(actor: Actor, input: { purpose: AttachmentPurpose; fileName: string; bytes: Uint8Array; maxBytes?: number }): Promise<SavedAttachment> {
  const maxBytes = input.maxBytes ?? getEnv().UPLOAD_MAX_BYTES;
  if (input.bytes.byteLength === 0) throw new InputError("The file is empty.", { file: ["The file is empty."] });
  if (input.bytes.byteLength > maxBytes) {
    throw new AppError(`The file is larger than ${(maxBytes / 1024 / 1024).toFixed(0)} MB.`, 413, "too_large");
  }
  const sniffed = sniffFileType(input.bytes);
  const allowed = allowedTypes[input.purpose];
  if (!sniffed || !allowed.includes(sniffed)) {
    const wanted = allowed.map((t) => typeWords[t]).join(", ");
    const message = `This file is not a ${wanted} file${sniffed ? ` (its content is ${typeWords[sniffed]})` : ""}, whatever its name says.`;
    throw new InputError(message, { file: [message] });
  }
  const originalName = input.fileName.replace(/[\u0000-\u001f\\/]+/g, "_").slice(0, 200) || "upload";
  const store = getFileStore();
  const storageKey = await store.put(input.bytes);
  try {
    const [row] = await getDb()
      .insert(attachments)
      .values({ uploadedBy: actor.id, purpose: input.purpose, originalName, contentType: sniffed, sizeBytes: input.bytes.byteLength, sha256: createHash("sha256").update(input.bytes).digest("hex"), storageKey, createdAt: new Date() })
      .$returningId();
    return { id: row!.id, originalName, contentType: sniffed, sizeBytes: input.bytes.byteLength };
  } catch (error) {
    await store.remove(storageKey);
    throw error;
  }
}

/**
 * An attachment's bytes, for those allowed to see it: its uploader, and the staff of a program
 * the file concerns (a tester's certificate or kit record in a program that tester applied to,
 * an import into the program). Anyone else gets "not found", not "forbidden".
 */
export async function readAttachment(actor: Actor, id: number): Promise<{ bytes: Buffer; contentType: string; originalName: string }> {
  const db = getDb();
  const [row] = await db.select().from(attachments).where(eq(attachments.id, id)).limit(1);
  if (!row) throw new NotFoundError();
  let isAllowed = row.uploadedBy === actor.id;
  if (!isAllowed && (actor.role === "inspector" || actor.role === "admin") && actor.programId !== null) {
    if (row.purpose === "certification" || row.purpose === "kit_verification") {
      const [link] = await db
        .select({ id: testerApprovals.id })
        .from(testerApprovals)
        .leftJoin(certifications, eq(certifications.testerId, testerApprovals.testerId))
        .leftJoin(testKits, eq(testKits.testerId, testerApprovals.testerId))
        .where(and(eq(testerApprovals.programId, actor.programId), or(eq(certifications.attachmentId, id), eq(testKits.attachmentId, id))))
        .limit(1);
      isAllowed = Boolean(link);
    } else if (row.purpose === "inventory_import" || row.purpose === "import_errors") {
      const [job] = await db
        .select({ id: importJobs.id })
        .from(importJobs)
        .where(and(eq(importJobs.programId, actor.programId), or(eq(importJobs.fileId, id), eq(importJobs.errorFileId, id))))
        .limit(1);
      isAllowed = Boolean(job);
    }
  }
  if (!isAllowed) throw new NotFoundError();
  return { bytes: await getFileStore().get(row.storageKey), contentType: row.contentType, originalName: row.originalName };
}

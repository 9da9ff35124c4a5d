import "server-only";
import { and, eq, isNull } from "drizzle-orm";
import type { Executor } from "@/db/client";
import { certificates } from "@/db/schema";
import { generateReadableCode } from "@/lib/auth/tokens";

/**
 * 12 characters from a 31-letter alphabet (about 59 bits): printed on the certificate and
 * checked at /verify/<code>. Unguessable, yet short enough to type from paper.
 */
export function generateCertificateCode(): string {
  return generateReadableCode(12);
}

/**
 * Issues the compliance certificate of an accepted passing report inside the caller's
 * transaction; a re-issue supersedes the report's previous certificate, whose code then
 * verifies as "replaced".
 */
export async function issueCertificate(tx: Executor, input: { reportId: number; issuedBy: number | null }): Promise<{ code: string }> {
  const now = new Date();
  await tx
    .update(certificates)
    .set({ supersededAt: now })
    .where(and(eq(certificates.reportId, input.reportId), isNull(certificates.supersededAt)));
  const code = generateCertificateCode();
  await tx.insert(certificates).values({ reportId: input.reportId, code, issuedAt: now, issuedBy: input.issuedBy });
  return { code };
}

// What a tester must be told about their certification and kits: expired, or expiring within the
// warning window (30 days by default). Pure: today is an argument.
import { addDays, addMonths, daysBetween } from "@/lib/rules";

export const CREDENTIAL_WARNING_DAYS = 30;

export interface CredentialWarning {
  tone: "danger" | "warning";
  subject: "certification" | "kit";
  /** The kit's id, for a link; null for the certification. */
  kitId: number | null;
  message: string;
}

export interface CertificationLike {
  certifyingBody: string;
  number: string;
  expiresOn: string;
}

export interface KitLike {
  id: number;
  make: string;
  model: string;
  serial: string;
  lastVerifiedOn: string;
  verificationResult: "passed" | "adjusted" | "failed";
  retiredAt: string | null;
}

const inDays = (days: number) => (days === 0 ? "today" : days === 1 ? "tomorrow" : `in ${days} days`);

/** The last day a kit's accuracy check covers (verified within verificationMaxMonths, 12 by default). */
export function kitValidUntil(lastVerifiedOn: string, verificationMaxMonths = 12): string {
  return addMonths(lastVerifiedOn, verificationMaxMonths);
}

/**
 * Warnings for the home page and the credentials page, most urgent first. The current
 * certification is the one that expires last.
 */
export function findCredentialWarnings(args: { certifications: readonly CertificationLike[]; kits: readonly KitLike[]; today: string; verificationMaxMonths?: number; warningDays?: number }): CredentialWarning[] {
  const { today } = args;
  const warningDays = args.warningDays ?? CREDENTIAL_WARNING_DAYS;
  const horizon = addDays(today, warningDays);
  const warnings: CredentialWarning[] = [];
  const current = [...args.certifications].sort((a, b) => (a.expiresOn < b.expiresOn ? 1 : -1))[0];
  if (!current) warnings.push({ tone: "danger", subject: "certification", kitId: null, message: "No certification is on file: add yours before you file a report." });
  else if (current.expiresOn < today) warnings.push({ tone: "danger", subject: "certification", kitId: null, message: `Your certification ${current.number} expired on ${current.expiresOn}: you cannot file reports until you add the renewed one.` });
  else if (current.expiresOn <= horizon) warnings.push({ tone: "warning", subject: "certification", kitId: null, message: `Your certification ${current.number} expires on ${current.expiresOn} (${inDays(daysBetween(today, current.expiresOn))}): renew it and upload the new certificate.` });

  const active = args.kits.filter((kit) => kit.retiredAt === null);
  if (active.length === 0) warnings.push({ tone: "danger", subject: "kit", kitId: null, message: "No test kit is on file: add the gauge you test with and its latest accuracy check." });
  for (const kit of active) {
    const name = `${kit.make} ${kit.model} (${kit.serial})`;
    const until = kitValidUntil(kit.lastVerifiedOn, args.verificationMaxMonths);
    if (kit.verificationResult === "failed") warnings.push({ tone: "danger", subject: "kit", kitId: kit.id, message: `Kit ${name} failed its last accuracy check: it cannot be used until it passes one.` });
    else if (until < today) warnings.push({ tone: "danger", subject: "kit", kitId: kit.id, message: `Kit ${name} was last checked for accuracy on ${kit.lastVerifiedOn}; that covered tests until ${until}. Have it checked and record the new date.` });
    else if (until <= horizon) warnings.push({ tone: "warning", subject: "kit", kitId: kit.id, message: `Kit ${name} needs its accuracy check by ${until} (${inDays(daysBetween(today, until))}).` });
  }
  return warnings.sort((a, b) => (a.tone === b.tone ? 0 : a.tone === "danger" ? -1 : 1));
}

export interface CredentialBadge {
  tone: "pass" | "caution" | "fail";
  text: string;
}

/** A certification's standing today, in two or three words. */
export function describeCertification(cert: { expiresOn: string }, today: string, warningDays = CREDENTIAL_WARNING_DAYS): CredentialBadge {
  if (cert.expiresOn < today) return { tone: "fail", text: `Expired ${cert.expiresOn}` };
  if (cert.expiresOn <= addDays(today, warningDays)) return { tone: "caution", text: `Expires ${cert.expiresOn}` };
  return { tone: "pass", text: `Valid until ${cert.expiresOn}` };
}

/** A kit's standing today: failed, overdue for its accuracy check, due soon, or good until a date. */
export function describeKit(kit: { validUntil: string; verificationResult: "passed" | "adjusted" | "failed" }, today: string, warningDays = CREDENTIAL_WARNING_DAYS): CredentialBadge {
  if (kit.verificationResult === "failed") return { tone: "fail", text: "Failed its accuracy check" };
  if (kit.validUntil < today) return { tone: "fail", text: `Check overdue since ${kit.validUntil}` };
  if (kit.validUntil <= addDays(today, warningDays)) return { tone: "caution", text: `Check due by ${kit.validUntil}` };
  return { tone: "pass", text: `Good until ${kit.validUntil}` };
}

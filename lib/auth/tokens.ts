import { createHash, randomBytes } from "node:crypto";

/** 160 random bits, URL-safe: enough that guessing a session or a link is hopeless. */
export function generateSecretToken(bytes = 20): string {
  return randomBytes(bytes).toString("base64url");
}

/** Only this hash is stored, so a copy of the database does not sign anybody in. */
export function hashToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

/** A short code for a printed letter: no 0/O, 1/I/L look-alikes. */
export function generateReadableCode(length = 10): string {
  const alphabet = "ABCDEFGHJKMNPQRSTUVWXYZ23456789";
  const bytes = randomBytes(length);
  let code = "";
  for (let i = 0; i < length; i++) code += alphabet[bytes[i]! % alphabet.length];
  return code;
}

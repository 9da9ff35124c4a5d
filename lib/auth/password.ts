import { hash, verify } from "@node-rs/argon2";

// argon2id with the library's defaults (m=19456 KiB, t=2, p=1), the OWASP-recommended minimum.
export async function hashPassword(password: string): Promise<string> {
  return hash(password);
}

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password);
  } catch {
    return false;
  }
}

/** Same cost as a real check, so a missing account answers no faster than a wrong password. */
const dummyHashPromise = hash("not-a-real-password-but-the-same-cost");
export async function verifyAgainstDummy(password: string): Promise<false> {
  await verifyPassword(await dummyHashPromise, password);
  return false;
}

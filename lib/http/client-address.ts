import { getEnv } from "@/lib/env";

/** The client's address for throttling; forwarded headers are believed only behind our own proxy. */
export function clientAddress(headers: Headers): string {
  if (getEnv().TRUST_PROXY) {
    const forwarded = headers.get("x-forwarded-for")?.split(",")[0]?.trim();
    if (forwarded) return forwarded;
    const real = headers.get("x-real-ip");
    if (real) return real;
  }
  return "direct";
}

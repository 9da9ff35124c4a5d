import { z } from "zod";

/**
 * The one place that reads process.env. Empty strings count as unset, so a blank line in an
 * .env file falls back to the default instead of becoming "".
 */
const blankAsUndefined = (value: unknown) => (typeof value === "string" && value.trim() === "" ? undefined : value);
const optional = <T extends z.ZodType>(schema: T) => z.preprocess(blankAsUndefined, schema.optional());
const withDefault = <T extends z.ZodType>(schema: T, fallback: z.input<T>) => z.preprocess(blankAsUndefined, schema.default(fallback as never));
const flag = (fallback: boolean) =>
  z.preprocess((value) => {
    const v = blankAsUndefined(value);
    if (v === undefined) return fallback;
    return v === "1" || v === "true" || v === "yes";
  }, z.boolean());

const schema = z.object({
  DATABASE_URL: withDefault(z.string().startsWith("mysql://"), "mysql://root@127.0.0.1:3307/zoneward"),
  DB_POOL_SIZE: withDefault(z.coerce.number().int().min(1).max(200), 20),
  APP_URL: withDefault(z.url(), "http://localhost:3000"),
  DATA_DIR: withDefault(z.string(), ".data"),
  /** Secure cookies are a runtime choice: the build inlines NODE_ENV, so it cannot be keyed on that. */
  COOKIE_SECURE: optional(z.string()),
  SESSION_DAYS: withDefault(z.coerce.number().int().min(1).max(90), 14),
  RESEND_API_KEY: withDefault(z.string().min(1), "re_local_standin"),
  /** Base URL of the mail API; unset means the hosted service. The start and test scripts point it at the stand-in. */
  RESEND_BASE_URL: optional(z.url()),
  MAIL_FROM: withDefault(z.string().min(3), "Zoneward <notices@zoneward.invalid>"),
  /** Where the admin mailbox page reads messages from (the local stand-in only). */
  MAIL_STANDIN_URL: optional(z.url()),
  /** Payments go through the Stripe SDK. The default key is the local stand-in's; a real secret key means the hosted service. */
  STRIPE_SECRET_KEY: withDefault(z.string().min(1), "sk_test_local_standin"),
  /** The secret that signs webhook deliveries (the stand-in's default, or the hosted endpoint's signing secret). */
  STRIPE_WEBHOOK_SECRET: withDefault(z.string().min(1), "whsec_local_standin"),
  /** Base URL of the payments API; unset means the hosted service. The start and test scripts point it at the stand-in. */
  STRIPE_API_URL: optional(z.url()),
  UPLOAD_MAX_BYTES: withDefault(z.coerce.number().int().min(1024), 10 * 1024 * 1024),
  TRUST_PROXY: flag(false),
});

export type Env = z.infer<typeof schema> & { cookieSecure: boolean };

let cached: Env | undefined;

export function getEnv(): Env {
  if (cached) return cached;
  const parsed = schema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => `  ${issue.path.join(".")}: ${issue.message}`);
    throw new Error(`Invalid environment:\n${lines.join("\n")}`);
  }
  const data = parsed.data;
  const cookieSecure = data.COOKIE_SECURE === undefined ? data.APP_URL.startsWith("https://") : data.COOKIE_SECURE === "true" || data.COOKIE_SECURE === "1";
  cached = { ...data, cookieSecure };
  return cached;
}

/** For tests that change the environment between cases. */
export function resetEnvForTests(): void {
  cached = undefined;
}

/**
 * Errors the data layer throws on purpose. Route handlers and actions turn them into a status
 * and a clear message; anything else is a bug and answers 500 without details.
 */
export class AppError extends Error {
  constructor(
    message: string,
    public readonly status: number,
    public readonly code: string,
  ) {
    super(message);
    this.name = new.target.name;
  }
}

export type FieldErrors = Record<string, string[]>;

export class InputError extends AppError {
  constructor(
    message: string,
    public readonly fieldErrors: FieldErrors = {},
  ) {
    super(message, 422, "invalid_input");
  }
}

export class NotFoundError extends AppError {
  constructor(message = "Not found.") {
    super(message, 404, "not_found");
  }
}

export class ConflictError extends AppError {
  constructor(message: string, code = "conflict") {
    super(message, 409, code);
  }
}

export class ForbiddenError extends AppError {
  constructor(message = "You are not allowed to do this.") {
    super(message, 403, "forbidden");
  }
}

export class TooManyRequestsError extends AppError {
  constructor(
    message: string,
    public readonly retryAfterSeconds: number,
  ) {
    super(message, 429, "too_many_requests");
  }
}

export class ServiceUnavailableError extends AppError {
  constructor(message = "The service is briefly unavailable. Your work is kept; please try again in a few seconds.") {
    super(message, 503, "unavailable");
  }
}

const connectionErrorCodes = new Set(["ECONNREFUSED", "ECONNRESET", "PROTOCOL_CONNECTION_LOST", "ETIMEDOUT", "EPIPE", "ER_CON_COUNT_ERROR", "POOL_CLOSED", "ER_SERVER_SHUTDOWN", "EHOSTUNREACH", "PROTOCOL_SEQUENCE_TIMEOUT", "ER_LOCK_WAIT_TIMEOUT"]);

/** True when the database could not be reached: the request may succeed if retried. */
export function isDatabaseUnavailable(error: unknown): boolean {
  let current: unknown = error;
  for (let depth = 0; depth < 5 && current; depth++) {
    const code = (current as { code?: unknown }).code;
    if (typeof code === "string" && connectionErrorCodes.has(code)) return true;
    const message = (current as { message?: unknown }).message;
    if (typeof message === "string" && /connect ECONNREFUSED|Connection lost|Pool is closed|socket hang up|closed state/i.test(message)) return true;
    current = (current as { cause?: unknown }).cause;
  }
  return false;
}

export function isDuplicateKey(error: unknown): boolean {
  let current: unknown = error;
  for (let depth = 0; depth < 5 && current; depth++) {
    if ((current as { code?: unknown }).code === "ER_DUP_ENTRY") return true;
    current = (current as { cause?: unknown }).cause;
  }
  return false;
}

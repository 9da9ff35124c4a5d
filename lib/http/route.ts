import "server-only";
import { z } from "zod";
import { can, PermissionError, type Actor, type Permission } from "@/lib/auth/permissions";
import { getActor } from "@/lib/auth/session";
import { AppError, InputError, isDatabaseUnavailable, TooManyRequestsError } from "@/lib/errors";
import { isSameOriginRequest } from "./origin";

export const DEFAULT_MAX_BODY_BYTES = 256 * 1024;

export function jsonResponse(body: unknown, init: ResponseInit = {}): Response {
  const headers = new Headers(init.headers);
  headers.set("content-type", "application/json; charset=utf-8");
  headers.set("cache-control", "no-store");
  return new Response(JSON.stringify(body), { ...init, headers });
}

export function errorResponse(status: number, message: string, extra: Record<string, unknown> = {}, headers: HeadersInit = {}): Response {
  return jsonResponse({ error: message, ...extra }, { status, headers });
}

/** Turns a thrown error into an answer; never leaks internals on a 500. */
export function responseForError(error: unknown): Response {
  if (error instanceof TooManyRequestsError) return errorResponse(429, error.message, { code: error.code }, { "retry-after": String(error.retryAfterSeconds) });
  if (error instanceof InputError) return errorResponse(422, error.message, { code: error.code, fieldErrors: error.fieldErrors });
  if (error instanceof AppError) return errorResponse(error.status, error.message, { code: error.code });
  if (error instanceof PermissionError) return errorResponse(403, "You are not allowed to do this.", { code: "forbidden" });
  if (isDatabaseUnavailable(error)) {
    return errorResponse(503, "The service is briefly unavailable. Your work is kept; please try again in a few seconds.", { code: "unavailable" }, { "retry-after": "5" });
  }
  console.error("[api] unexpected error", error);
  return errorResponse(500, "Something went wrong on our side. Please try again.", { code: "internal" });
}

/** Reads a JSON body with a hard size limit; an oversized body is refused before parsing. */
export async function readJsonBody(request: Request, maxBytes = DEFAULT_MAX_BODY_BYTES): Promise<unknown> {
  const declared = Number(request.headers.get("content-length") ?? "0");
  if (declared > maxBytes) throw new AppError(`The request is too large (limit ${Math.round(maxBytes / 1024)} KB).`, 413, "too_large");
  const reader = request.body?.getReader();
  if (!reader) return undefined;
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > maxBytes) {
      await reader.cancel();
      throw new AppError(`The request is too large (limit ${Math.round(maxBytes / 1024)} KB).`, 413, "too_large");
    }
    chunks.push(value);
  }
  if (size === 0) return undefined;
  const text = Buffer.concat(chunks).toString("utf8");
  try {
    return JSON.parse(text);
  } catch {
    throw new AppError("The request body is not valid JSON.", 400, "bad_json");
  }
}

export function fieldErrorsOf(error: z.ZodError): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join(".") : "_";
    (out[key] ??= []).push(issue.message);
  }
  return out;
}

export function parseOrThrow<S extends z.ZodType>(schema: S, value: unknown): z.output<S> {
  const result = schema.safeParse(value);
  if (!result.success) {
    const fieldErrors = fieldErrorsOf(result.error);
    const first = result.error.issues[0];
    const where = first && first.path.length ? `${first.path.join(".")}: ` : "";
    throw new InputError(`Please check the highlighted fields. ${where}${first?.message ?? ""}`.trim(), fieldErrors);
  }
  return result.data;
}

type Params = Record<string, string | string[] | undefined>;

interface RouteOptions<S extends z.ZodType | undefined> {
  /** null = public route (no sign-in needed). */
  permission: Permission | null;
  body?: S;
  maxBodyBytes?: number;
}

interface RouteContext<S extends z.ZodType | undefined, A extends Actor | null> {
  request: Request;
  actor: A;
  body: S extends z.ZodType ? z.output<S> : undefined;
  params: Params;
  searchParams: URLSearchParams;
}

/**
 * The one wrapper for JSON route handlers: Origin check on state-changing methods, sign-in
 * and permission check, body size limit and zod validation, and errors turned into clear
 * JSON answers. Ownership of the record is the data layer's check.
 */
export function apiRoute<S extends z.ZodType | undefined = undefined>(
  options: RouteOptions<S> & { permission: Permission },
  handler: (context: RouteContext<S, Actor>) => Promise<unknown>,
): (request: Request, context: { params: Promise<Params> }) => Promise<Response>;
export function apiRoute<S extends z.ZodType | undefined = undefined>(
  options: RouteOptions<S> & { permission: null },
  handler: (context: RouteContext<S, Actor | null>) => Promise<unknown>,
): (request: Request, context: { params: Promise<Params> }) => Promise<Response>;
export function apiRoute<S extends z.ZodType | undefined>(
  options: RouteOptions<S>,
  // The overloads above type the actor; here it is whichever the permission guarantees.
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  handler: (context: RouteContext<S, any>) => Promise<unknown>,
) {
  return async (request: Request, context: { params: Promise<Params> }): Promise<Response> => {
    try {
      const method = request.method.toUpperCase();
      const isStateChanging = method !== "GET" && method !== "HEAD" && method !== "OPTIONS";
      if (isStateChanging && !isSameOriginRequest(request)) return errorResponse(403, "This request came from another site and was refused.", { code: "bad_origin" });
      const actor = await getActor();
      if (options.permission !== null) {
        if (!actor) return errorResponse(401, "Please sign in.", { code: "signed_out" });
        if (!can(actor, options.permission)) return errorResponse(403, "You are not allowed to do this.", { code: "forbidden" });
      }
      let body: unknown = undefined;
      if (options.body) {
        const raw = await readJsonBody(request, options.maxBodyBytes);
        body = parseOrThrow(options.body, raw ?? {});
      }
      const result = await handler({
        request,
        actor,
        body: body as RouteContext<S, Actor | null>["body"],
        params: (await context.params) ?? {},
        searchParams: new URL(request.url).searchParams,
      });
      return result instanceof Response ? result : jsonResponse(result ?? { ok: true });
    } catch (error) {
      return responseForError(error);
    }
  };
}

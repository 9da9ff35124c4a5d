// POST /api/files: uploads one file (multipart: "file" and "purpose"); checks size and real type.
import { z } from "zod";
import { getActor } from "@/lib/auth/session";
import { saveUpload } from "@/lib/data/attachments";
import { getEnv } from "@/lib/env";
import { isSameOriginRequest } from "@/lib/http/origin";
import { errorResponse, jsonResponse, parseOrThrow, responseForError } from "@/lib/http/route";

export const runtime = "nodejs";

const purposeSchema = z.enum(["certification", "kit_verification", "inventory_import"], { message: "Say what the file is for: certification, kit_verification or inventory_import." });

export async function POST(request: Request): Promise<Response> {
  try {
    if (!isSameOriginRequest(request)) return errorResponse(403, "This request came from another site and was refused.", { code: "bad_origin" });
    const actor = await getActor();
    if (!actor) return errorResponse(401, "Please sign in.", { code: "signed_out" });
    const limit = getEnv().UPLOAD_MAX_BYTES;
    const purpose = parseOrThrow(purposeSchema, new URL(request.url).searchParams.get("purpose") ?? undefined);
    const isTesterFile = purpose === "certification" || purpose === "kit_verification";
    if (isTesterFile ? actor.role !== "tester" : actor.role !== "inspector" && actor.role !== "admin") return errorResponse(403, "You are not allowed to upload this kind of file.", { code: "forbidden" });
    const maxBytes = purpose === "inventory_import" ? 60 * 1024 * 1024 : limit;
    // Refuse an oversized upload from its declared length without keeping it. The rest of the
    // body is read and thrown away (up to a bound) so the client hears the answer instead of a
    // broken pipe; a body past the bound is cut off.
    const declared = Number(request.headers.get("content-length") ?? "0");
    if (declared > maxBytes + 64 * 1024) {
      await discardBody(request, 2 * maxBytes);
      return errorResponse(413, `The file is larger than ${(maxBytes / 1024 / 1024).toFixed(0)} MB.`, { code: "too_large" });
    }
    const form = await request.formData().catch(() => null);
    const file = form?.get("file");
    if (!(file instanceof File)) return errorResponse(422, "Attach a file.", { code: "invalid_input", fieldErrors: { file: ["Attach a file."] } });
    const saved = await saveUpload(actor, { purpose, fileName: file.name, bytes: new Uint8Array(await file.arrayBuffer()), maxBytes });
    return jsonResponse(saved, { status: 201 });
  } catch (error) {
    return responseForError(error);
  }
}

async function discardBody(request: Request, limit: number): Promise<void> {
  const reader = request.body?.getReader();
  if (!reader) return;
  let seen = 0;
  try {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) return;
      seen += value.byteLength;
      if (seen > limit) {
        await reader.cancel();
        return;
      }
    }
  } catch {
    /* the client went away: nothing to answer */
  }
}

// POST /api/fees/webhook: the payments service's signed events (checkout paid or expired, refunds); 400 on a bad signature.
import { handlePaymentWebhook } from "@/lib/data/fees-webhook";
import { errorResponse, jsonResponse, responseForError } from "@/lib/http/route";
import { constructPaymentEvent, WebhookSignatureError } from "@/lib/payments/client";

export const runtime = "nodejs";

const MAX_WEBHOOK_BYTES = 512 * 1024;

/**
 * Not behind apiRoute: no session, no Origin, and the signature is checked against the exact
 * bytes received, so the body is read as text and never re-serialised before verification.
 */
export async function POST(request: Request): Promise<Response> {
  const declared = Number(request.headers.get("content-length") ?? "0");
  if (declared > MAX_WEBHOOK_BYTES) return errorResponse(413, "The event is too large.", { code: "too_large" });
  const rawBody = await request.text();
  if (Buffer.byteLength(rawBody) > MAX_WEBHOOK_BYTES) return errorResponse(413, "The event is too large.", { code: "too_large" });
  let event;
  try {
    event = constructPaymentEvent(rawBody, request.headers.get("stripe-signature"));
  } catch (error) {
    if (error instanceof WebhookSignatureError) {
      console.warn("[payments] refused a webhook with a missing or bad signature");
      return errorResponse(400, error.message, { code: error.code });
    }
    return responseForError(error);
  }
  try {
    const result = await handlePaymentWebhook(event);
    return jsonResponse({ received: true, outcome: result.outcome, duplicate: result.isDuplicate });
  } catch (error) {
    // A 5xx makes the service retry later; the event was not recorded, so the retry applies it.
    return responseForError(error);
  }
}

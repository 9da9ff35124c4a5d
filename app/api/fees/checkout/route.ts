// POST /api/fees/checkout: opens one checkout for the chosen owed reports; the amount is computed here, never sent.
import { checkoutRequestSchema, startFeeCheckout } from "@/lib/data/fees";
import { apiRoute } from "@/lib/http/route";

export const runtime = "nodejs";

export const POST = apiRoute({ permission: "fees.pay", body: checkoutRequestSchema, maxBodyBytes: 16 * 1024 }, async ({ actor, body }) => {
  return startFeeCheckout(actor, body);
});

// POST /api/fees/payments/:id/cancel: closes an unpaid checkout the payer came back from, freeing its reports.
import { z } from "zod";
import { cancelFeeCheckout } from "@/lib/data/fees";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const runtime = "nodejs";

export const POST = apiRoute({ permission: "fees.pay" }, async ({ actor, params }) => {
  return cancelFeeCheckout(actor, parseOrThrow(z.coerce.number().int().positive(), params.id));
});

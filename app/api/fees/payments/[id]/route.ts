// GET /api/fees/payments/:id: a payment's state for its payer (the return page polls it until the webhook confirms).
import { z } from "zod";
import { getFeePayment } from "@/lib/data/fees";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const GET = apiRoute({ permission: "fees.pay" }, async ({ actor, params }) => {
  return getFeePayment(actor, parseOrThrow(z.coerce.number().int().positive(), params.id));
});

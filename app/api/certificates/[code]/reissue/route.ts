// POST /api/certificates/:code/reissue: the program's staff give a certificate a new code (the old one verifies as replaced).
import { z } from "zod";
import { reissueCertificate } from "@/lib/data/certificate-verification";
import { apiRoute } from "@/lib/http/route";

export const POST = apiRoute({ permission: "certificates.reissue", body: z.object({ confirm: z.literal(true, { error: "Confirm the re-issue with confirm: true." }) }), maxBodyBytes: 1024 }, async ({ actor, params }) => {
  const { code } = await reissueCertificate(actor, String(params.code ?? ""));
  return { ok: true, code, verifyPath: `/verify/${code}` };
});

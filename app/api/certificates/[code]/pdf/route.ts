// GET /api/certificates/:code/pdf: the compliance certificate, to the site's owners, the program's staff and the filing tester.
import { getCertificateDocument } from "@/lib/data/certificate-verification";
import { apiRoute } from "@/lib/http/route";
import { pdfResponse } from "@/lib/pdf/render";
import { renderCertificatePdf } from "@/lib/pdf/certificate-document";

export const runtime = "nodejs";

export const GET = apiRoute({ permission: null }, async ({ actor, params }) => {
  if (!actor) return Response.json({ error: "Please sign in." }, { status: 401 });
  const document = await getCertificateDocument(actor, String(params.code ?? ""));
  return pdfResponse(await renderCertificatePdf(document), document.fileName, "inline");
});

import { renderToBuffer } from "@react-pdf/renderer";
import type { ReactElement } from "react";
import { registerPdfFonts } from "./fonts";

/** Renders a react-pdf document to bytes on the server. */
export async function renderPdf(document: ReactElement): Promise<Buffer> {
  registerPdfFonts();
  // renderToBuffer's type wants a <Document> element; every caller passes one.
  return renderToBuffer(document as Parameters<typeof renderToBuffer>[0]);
}

/** A PDF download answer; inline so the browser shows it, with a safe file name. */
export function pdfResponse(bytes: Buffer, fileName: string, disposition: "inline" | "attachment" = "inline"): Response {
  const safe = fileName.replace(/[^A-Za-z0-9._-]+/g, "-");
  return new Response(new Uint8Array(bytes), {
    headers: {
      "content-type": "application/pdf",
      "content-disposition": `${disposition}; filename="${safe}"`,
      "cache-control": "private, no-store",
      "x-content-type-options": "nosniff",
    },
  });
}

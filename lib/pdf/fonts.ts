import { readFileSync } from "node:fs";
import path from "node:path";
import { Font } from "@react-pdf/renderer";
import { woffToSfnt } from "./woff-to-sfnt";

/** Two families, one per Unicode subset of the shipped font, used together as a fallback list. */
export const PDF_FONT_LATIN = "Source Sans 3";
export const PDF_FONT_LATIN_EXT = "Source Sans 3 Ext";
export const pdfFontFamily = [PDF_FONT_LATIN, PDF_FONT_LATIN_EXT];

let isRegistered = false;

/**
 * Registers the font files shipped in node_modules (.woff: react-pdf cannot read .woff2),
 * unpacked once per process to plain sfnt data (see woff-to-sfnt.ts: it makes each render
 * several times faster). Nothing is fetched from the network.
 */
export function registerPdfFonts(): void {
  if (isRegistered) return;
  const dir = path.join(process.cwd(), "node_modules", "@fontsource", "source-sans-3", "files");
  const file = (subset: string, weight: number, style = "normal") =>
    `data:font/ttf;base64,${woffToSfnt(readFileSync(path.join(dir, `source-sans-3-${subset}-${weight}-${style}.woff`))).toString("base64")}`;
  for (const [family, subset] of [
    [PDF_FONT_LATIN, "latin"],
    [PDF_FONT_LATIN_EXT, "latin-ext"],
  ] as const) {
    Font.register({
      family,
      fonts: [
        { src: file(subset, 400), fontWeight: 400 },
        { src: file(subset, 400, "italic"), fontWeight: 400, fontStyle: "italic" },
        { src: file(subset, 600), fontWeight: 600 },
        { src: file(subset, 700), fontWeight: 700 },
      ],
    });
  }
  // Words are not hyphenated: report numbers, serials and codes must stay whole.
  Font.registerHyphenationCallback((word) => [word]);
  isRegistered = true;
}

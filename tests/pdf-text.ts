import { createRequire } from "node:module";
import { dirname, join } from "node:path";
import { getDocument } from "pdfjs-dist/legacy/build/pdf.mjs";

/**
 * The text of a PDF, page by page, read with Mozilla's PDF.js (what browsers use to show PDFs):
 * a test checks what a reader would see, not the bytes pdfkit wrote. White space is folded to
 * single spaces, so a test matches "3 dives · 134 bottom minutes" whatever the line breaks.
 */
const standardFontDataUrl = join(dirname(createRequire(import.meta.url).resolve("pdfjs-dist/package.json")), "standard_fonts") + "/";

export async function pdfPages(bytes: Uint8Array): Promise<string[]> {
  const pdf = await getDocument({ data: new Uint8Array(bytes), standardFontDataUrl, isEvalSupported: false, verbosity: 0 }).promise;
  const pages: string[] = [];
  for (let number = 1; number <= pdf.numPages; number += 1) {
    const content = await (await pdf.getPage(number)).getTextContent();
    // Runs of words and figures (two fonts) come as separate items: joined, with white space as one space.
    pages.push(content.items.map((item) => ("str" in item ? item.str + (item.hasEOL ? " " : "") : "")).join("").replace(/\s+/g, " ").trim());
  }
  await pdf.destroy();
  return pages;
}

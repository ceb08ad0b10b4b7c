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

/** One run of text as PDF.js places it: page (1-based), left x and baseline y in points from the page's bottom left, width and size. */
export interface PdfTextItem {
  page: number;
  text: string;
  x: number;
  y: number;
  width: number;
  size: number;
}

/** Every run of text with its place on its page, and the pages' sizes: for tests of the layout (overlaps, margins, shared baselines). */
export async function pdfTextItems(bytes: Uint8Array): Promise<{ pages: Array<{ width: number; height: number }>; items: PdfTextItem[] }> {
  const pdf = await getDocument({ data: new Uint8Array(bytes), standardFontDataUrl, isEvalSupported: false, verbosity: 0 }).promise;
  const pages: Array<{ width: number; height: number }> = [];
  const items: PdfTextItem[] = [];
  for (let number = 1; number <= pdf.numPages; number += 1) {
    const page = await pdf.getPage(number);
    const [, , width, height] = page.view;
    pages.push({ width: width!, height: height! });
    for (const item of (await page.getTextContent()).items) {
      if (!("str" in item) || item.str.trim() === "") continue;
      items.push({ page: number, text: item.str, x: item.transform[4], y: item.transform[5], width: item.width, size: Math.hypot(item.transform[2], item.transform[3]) });
    }
  }
  await pdf.destroy();
  return { pages, items };
}

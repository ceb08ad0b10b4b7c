import type { Page } from "@playwright/test";

/**
 * The cells of the open page's tables that hold a number (with or without its unit: "12", "1,234.5 yd³",
 * "−0.4 ft", "85 %") but are not set as figures: their digits not in the mono font (`figures`
 * class), or the cell not aligned to the right (or centre) as every other figure column is. Each
 * is named by its table, row and column, so a failure says where to look. A column counts as
 * figures when every non-empty cell in it is a number ("–" and "none" are empty).
 */
export async function unmarkedFigureCells(page: Page): Promise<string[]> {
  return page.locator("table").evaluateAll((tables) => {
    const number = /^[−\-+±]?\s?\d[\d,]*(\.\d+)?\s?(%|[A-Za-z³²°/·]+(\/[A-Za-z]+)?)?$/;
    const blank = /^(–|—|-|none)?$/;
    const problems: string[] = [];
    tables.forEach((table, tableIndex) => {
      if (!(table as HTMLElement).offsetParent) return;
      const name = table.getAttribute("aria-label") || table.querySelector("caption")?.textContent?.trim() || `table ${tableIndex + 1}`;
      const headers = [...table.querySelectorAll("thead tr:last-child th")].map((th) => th.textContent?.trim() ?? "");
      const columns = new Map<number, HTMLTableCellElement[]>();
      for (const row of table.querySelectorAll("tbody tr")) {
        [...(row as HTMLTableRowElement).cells].forEach((cell, index) => {
          if (cell.tagName !== "TD" || cell.colSpan > 1) return;
          columns.set(index, [...(columns.get(index) ?? []), cell]);
        });
      }
      for (const [index, cells] of columns) {
        const texts = cells.map((cell) => (cell.textContent ?? "").replace(/\s+/g, " ").trim());
        const filled = texts.filter((text) => !blank.test(text));
        if (filled.length === 0 || !filled.every((text) => number.test(text))) continue;
        cells.forEach((cell, row) => {
          if (blank.test(texts[row])) return;
          const walker = document.createTreeWalker(cell, NodeFilter.SHOW_TEXT);
          let mono = true;
          for (let node = walker.nextNode(); node; node = walker.nextNode()) {
            if (/\d/.test(node.textContent ?? "") && !getComputedStyle(node.parentElement!).fontFamily.includes("Roboto Mono")) mono = false;
          }
          const align = getComputedStyle(cell).textAlign;
          const aligned = align === "right" || align === "end" || align === "center";
          if (!mono || !aligned) {
            problems.push(`${name}, row ${row + 1}, column ${index + 1} (${headers[index] || "no header"}): "${texts[row]}"${mono ? "" : " not in the mono"}${aligned ? "" : ` aligned ${align}`}`);
          }
        });
      }
    });
    return problems;
  });
}

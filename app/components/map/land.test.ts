import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { LAND_COLOUR } from "../../../shared/palette";

// The land is drawn by the page's stylesheet under each map's canvas (the style has no background
// layer); the palette's LAND_COLOUR is what the zone colours are checked against.
describe("the maps' land colour", () => {
  const css = readFileSync(new URL("../../app.css", import.meta.url), "utf8");

  it("is the palette's land colour", () => {
    expect(css).toMatch(new RegExp(`--color-land:\\s*${LAND_COLOUR};`, "i"));
  });

  it("is every map's background, printed too", () => {
    const rule = css.match(/\.maplibregl-map\s*\{([^}]*)\}/)?.[1] ?? "";
    expect(rule).toContain("background-color: var(--color-land)");
    expect(rule).toContain("print-color-adjust: exact");
  });
});

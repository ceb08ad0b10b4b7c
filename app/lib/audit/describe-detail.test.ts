import { describe, expect, it } from "vitest";
import { describeAuditDetail, describeChange } from "./describe-detail";

describe("an audit entry's detail in words", () => {
  it("says a settings change as the leaves that differ, nested keys joined, not the whole objects", () => {
    const before = { name: "Spring A", grid: { cellSize: 20, rotationDegrees: 0 }, zones: ["Upper run", "Lower run"], zoneColours: { "Upper run": "Teal", "Lower run": "Ochre" } };
    const after = { name: "Spring A", grid: { cellSize: 25, rotationDegrees: 0 }, zones: ["Upper run", "Lower run"], zoneColours: { "Upper run": "Slate", "Lower run": "Ochre" } };
    expect(describeChange(before, after)).toEqual(["grid › cellSize: 20 → 25", "zoneColours › Upper run: Teal → Slate"]);
    const text = describeAuditDetail({ before, after, recomputed: false });
    expect(text).toBe("grid › cellSize: 20 → 25; zoneColours › Upper run: Teal → Slate; recomputed: false");
    expect(text).not.toContain("[object Object]");
  });

  it("names what was added or removed, and says when nothing changed", () => {
    expect(describeChange({ zones: ["A"], zoneColours: { A: "Teal" } }, { zones: ["A", "B"], zoneColours: { A: "Teal", B: "Ochre" } })).toEqual(["zones: A → A, B", "zoneColours › B: — → Ochre"]);
    expect(describeChange({ workDay: { start: "07:00" } }, { workDay: null })).toEqual(["workDay › start: 07:00 → —"]);
    // A section set for the first time: its filled fields, not its blank ones nor the "none" it replaced.
    expect(describeChange({ emergency: null }, { emergency: { hospitalName: "Marrowby General", chamberName: "" } })).toEqual(["emergency › hospitalName: — → Marrowby General"]);
    expect(describeAuditDetail({ before: { name: "A" }, after: { name: "A" } })).toBe("nothing changed");
  });

  it("keeps other details as key and value, with the caller's words for a value", () => {
    expect(describeAuditDetail({ role: "manager", email: "a@example.org" }, (key, value) => (key === "role" ? "Project manager" : String(value)))).toBe("role: Project manager; email: a@example.org");
    expect(describeAuditDetail({ before: "x" })).toBe("before: x");
  });
});

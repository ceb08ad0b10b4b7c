import { describe, expect, it } from "vitest";
import { ROLES, roleLabel } from "./roles";

describe("roleLabel", () => {
  it("names every role as people know it, never by its internal name", () => {
    // practice: the titles the trade uses for these jobs
    expect(roleLabel("dewatering")).toBe("Dewatering operator");
    expect(roleLabel("dewatering", "sentence")).toBe("dewatering operator");
    expect(roleLabel(null)).toBe("Site administrator");
    for (const role of ROLES) expect(roleLabel(role), role).not.toBe(role);
    expect(new Set(ROLES.map((role) => roleLabel(role))).size).toBe(ROLES.length);
  });
});

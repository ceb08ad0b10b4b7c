import { describe, expect, it } from "vitest";
import { z } from "zod";
import { jsonObject, readJsonValue } from "./json-column";

const hoses = z.array(z.string());

describe("readJsonValue", () => {
  it("parses stored text and passes an already parsed value through, both checked", () => {
    expect(readJsonValue("dive_teams", "hoses", hoses, '["H1","H2"]', false)).toEqual(["H1", "H2"]);
    expect(readJsonValue("dive_teams", "hoses", hoses, ["H1"], false)).toEqual(["H1"]);
    expect(readJsonValue("audit_events", "detail", jsonObject, '{"email":"a@b.c"}', false)).toEqual({ email: "a@b.c" });
  });

  it("names the table and column when the stored value has the wrong shape or is not JSON", () => {
    expect(() => readJsonValue("dive_teams", "hoses", hoses, '{"H1":true}', false)).toThrow(/dive_teams\.hoses holds JSON of an unexpected shape/);
    expect(() => readJsonValue("dive_teams", "hoses", hoses, "[1, 2", false)).toThrow("dive_teams.hoses does not hold valid JSON.");
    expect(() => readJsonValue("audit_events", "detail", jsonObject, "[1]", false)).toThrow(/audit_events\.detail/);
  });

  it("gives null only where the column allows it", () => {
    expect(readJsonValue("import_jobs", "preview", jsonObject, null, true)).toBeNull();
    expect(() => readJsonValue("surveys", "qa", jsonObject, null, false)).toThrow("surveys.qa is empty, but the column requires a value.");
  });
});

import { describe, expect, it } from "vitest";
import { canonicalJson, checkIdempotencyKey, fingerprintOf } from "./idempotency";
import { assertCurrentVersion, etagOf, ifMatchVersions, versionOf } from "./versions";
import { PreconditionFailedError } from "~/lib/errors";

describe("checkIdempotencyKey", () => {
  it("takes no header as no key, and 1 to 100 characters of letters, digits, _ - : . (practice: a UUID)", () => {
    expect(checkIdempotencyKey(null)).toEqual({ ok: true, key: null });
    for (const key of ["a", "9f1c2a4e-6b7d-4c1e-9a53-0f2b7c6d8e91", "phone-42:0007.retry_2", "x".repeat(100)]) expect(checkIdempotencyKey(key)).toEqual({ ok: true, key });
  });

  it("refuses an empty key, one over 100 characters and other characters, saying which rule", () => {
    const refused = (key: string) => {
      const checked = checkIdempotencyKey(key);
      if (checked.ok) throw new Error(`${key} was taken`);
      return checked.message;
    };
    expect(refused("")).toMatch(/is empty/);
    expect(refused("x".repeat(101))).toMatch(/has 101 characters/);
    expect(refused("two words")).toMatch(/characters other than/);
    expect(refused("clé")).toMatch(/characters other than/);
    expect(refused("a/b")).toMatch(/Idempotency-Key/);
  });
});

describe("fingerprintOf", () => {
  it("reads two bodies with the same fields in another order as one (computed)", () => {
    expect(canonicalJson({ b: 1, a: { d: [1, { z: 1, y: 2 }], c: null } })).toBe('{"a":{"c":null,"d":[1,{"y":2,"z":1}]},"b":1}');
    expect(fingerprintOf({ value: 7, station: "BG-1" })).toBe(fingerprintOf({ station: "BG-1", value: 7 }));
  });

  it("tells bodies apart by any value, and leaves out undefined fields as JSON does", () => {
    expect(fingerprintOf({ value: 7 })).not.toBe(fingerprintOf({ value: 7.000001 }));
    expect(fingerprintOf({ cells: ["B7", "C7"] })).not.toBe(fingerprintOf({ cells: ["C7", "B7"] }));
    expect(fingerprintOf({ value: 7, note: undefined })).toBe(fingerprintOf({ value: 7 }));
    // SHA-256 of "{}" (computed with sha256sum).
    expect(fingerprintOf({})).toBe("44136fa355b3678a1146ad16f7e8649e94fb4fc21fe77e8310c060f61caaff8a");
  });
});

describe("versions for If-Match", () => {
  it("takes a record's version from its content: any change gives another, the same record the same (computed)", () => {
    const tube = { id: 4, status: "filling", fills: [{ id: 1, drySolids: 10 }] };
    expect(versionOf(tube)).toMatch(/^[0-9a-f]{20}$/);
    expect(versionOf({ ...tube })).toBe(versionOf(tube));
    expect(versionOf({ ...tube, status: "dewatering" })).not.toBe(versionOf(tube));
    expect(versionOf({ ...tube, fills: [...tube.fills, { id: 2, drySolids: 1 }] })).not.toBe(versionOf(tube));
    expect(etagOf("abc")).toBe('"abc"');
  });

  it("reads If-Match as a quoted, weak or bare tag, a list, or * (RFC 9110 §13.1.1)", () => {
    expect(ifMatchVersions(null)).toBeNull();
    expect(ifMatchVersions('"17"')).toEqual(["17"]);
    expect(ifMatchVersions('W/"17", "18"')).toEqual(["17", "18"]);
    expect(ifMatchVersions("17")).toEqual(["17"]);
    expect(ifMatchVersions(" * ")).toBe("any");
  });

  it("lets an edit through without If-Match, with * or the current version, and refuses another with the current record", () => {
    const current = { id: 4, status: "dewatering", version: "v2" };
    for (const wanted of [null, "any" as const, ["v1", "v2"]]) expect(() => assertCurrentVersion(wanted, current, "tube")).not.toThrow();
    const refused = (() => {
      try {
        assertCurrentVersion(["v1"], current, "tube");
      } catch (error) {
        return error;
      }
    })();
    expect(refused).toBeInstanceOf(PreconditionFailedError);
    expect((refused as PreconditionFailedError).extra.current).toEqual(current);
    expect((refused as PreconditionFailedError).details[0].field).toBe("If-Match");
  });
});

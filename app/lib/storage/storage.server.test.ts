import { randomBytes } from "node:crypto";
import { describe, expect, it } from "vitest";
import { deleteObject, getObject, listObjectKeys, objectKey, putObject } from "./storage.server";

// Against the fake S3 server `npm test` starts (S3_ENDPOINT): the bytes that go in come back out
// unchanged, and a removed object is gone.

describe("object storage", () => {
  it("stores, reads back byte for byte, and deletes", async () => {
    const key = objectKey(["tests", "storage", `${randomBytes(6).toString("hex")}.bin`]);
    const bytes = randomBytes(200_000);
    await putObject(key, bytes, "application/octet-stream");
    const stored = await getObject(key);
    expect(stored?.contentType).toBe("application/octet-stream");
    expect(Buffer.compare(stored!.bytes, bytes)).toBe(0);
    expect(await listObjectKeys("tests/storage/")).toContain(key);
    await deleteObject(key);
    expect(await getObject(key)).toBeNull();
    expect(await listObjectKeys("tests/storage/")).not.toContain(key);
    // Deleting again is not an error.
    await deleteObject(key);
  });

  it("reads null for a key never stored", async () => {
    expect(await getObject(objectKey(["tests", "storage", "never-stored.bin"]))).toBeNull();
  });

  it("refuses key parts that could leave their folder", () => {
    for (const part of ["..", ".", "a/b", "", "../x", "x y", "-x"]) expect(() => objectKey(["projects", part]), part).toThrow();
    expect(objectKey(["projects", 7, "finds", "a_b-1.jpg"])).toBe("projects/7/finds/a_b-1.jpg");
  });
});

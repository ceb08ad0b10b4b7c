import { describe, expect, it } from "vitest";
import { z } from "zod";
import { BadRequestError, PayloadTooLargeError, ValidationError } from "~/lib/errors";
import { readApiBody, readApiInput } from "./body.server";
import { UnsupportedMediaTypeError } from "./errors.server";

const URL_ = "http://127.0.0.1/api/x";
const post = (body: BodyInit | null, headers: Record<string, string> = {}) => new Request(URL_, { method: "POST", body, headers });
const json = (value: unknown) => post(JSON.stringify(value), { "Content-Type": "application/json" });
const schema = z.object({ name: z.string().min(1, "give a name"), count: z.number().int() });

/** An endless body that counts how many chunks it was asked for: only a reader that stops at the limit returns. */
/** An endless body that, past `gateChunks` chunks, waits forever: a reader that needed more would never finish. */
function endlessBody(chunkBytes: number, gateChunks = Number.POSITIVE_INFINITY) {
  let pulled = 0;
  const stream = new ReadableStream<Uint8Array>({
    async pull(controller) {
      if (pulled >= gateChunks) await new Promise(() => undefined);
      pulled++;
      controller.enqueue(new Uint8Array(chunkBytes).fill(0x20));
    },
  });
  return { stream, pulled: () => pulled };
}

describe("readApiBody", () => {
  it("reads JSON (also a +json type) and checks it with the schema", async () => {
    expect(await readApiBody(json({ name: "Team Heron", count: 2 }), schema)).toEqual({ name: "Team Heron", count: 2 });
    const merge = post(JSON.stringify({ name: "x", count: 1 }), { "Content-Type": "application/merge-patch+json; charset=utf-8" });
    expect(await readApiBody(merge, schema)).toEqual({ name: "x", count: 1 });
  });

  it("names each field a body breaks (422)", async () => {
    const error = await readApiBody(json({ name: "", count: 1.5 }), schema).catch((thrown: unknown) => thrown);
    expect(error).toBeInstanceOf(ValidationError);
    expect((error as ValidationError).details.map((detail) => detail.field).sort()).toEqual(["count", "name"]);
    expect((error as ValidationError).details.find((detail) => detail.field === "name")?.message).toBe("give a name");
  });

  it("reads an empty body as {} whatever its type, so the schema says what is missing", async () => {
    for (const request of [post(null), post("", { "Content-Type": "text/plain" }), post("", { "Content-Type": "application/json" })]) {
      const error = await readApiBody(request, schema).catch((thrown: unknown) => thrown);
      expect(error).toBeInstanceOf(ValidationError);
      expect((error as ValidationError).details.map((detail) => detail.field).sort()).toEqual(["count", "name"]);
    }
  });

  it("refuses a type it does not read with 415, before reading a declared body", async () => {
    const plain = post("name=x", { "Content-Type": "text/plain", "Content-Length": "6" });
    await expect(readApiBody(plain, schema)).rejects.toBeInstanceOf(UnsupportedMediaTypeError);
    expect(plain.bodyUsed).toBe(false);
    // A JSON-only route refuses a form; a body without any Content-Type is refused too.
    await expect(readApiBody(post(new URLSearchParams({ name: "x" })), schema, { formats: ["json"] })).rejects.toBeInstanceOf(UnsupportedMediaTypeError);
    await expect(readApiBody(new Request(URL_, { method: "POST", body: new Blob(["{}"]) }), schema)).rejects.toBeInstanceOf(UnsupportedMediaTypeError);
  });

  it("answers 400 for JSON that does not parse and for text that is not UTF-8", async () => {
    await expect(readApiBody(post("{name:", { "Content-Type": "application/json" }), schema)).rejects.toBeInstanceOf(BadRequestError);
    await expect(readApiBody(post(new Uint8Array([0x7b, 0xff, 0xfe, 0x7d]), { "Content-Type": "application/json" }), schema)).rejects.toBeInstanceOf(BadRequestError);
  });

  it("parses 10,000 levels of nesting without overflowing the stack, then refuses it by the schema", async () => {
    const deep = `${'{"name":'.repeat(10_000)}"x"${"}".repeat(10_000)}`;
    await expect(readApiBody(post(deep, { "Content-Type": "application/json" }), schema)).rejects.toBeInstanceOf(ValidationError);
  });

  it("refuses a declared Content-Length over the limit before reading (413)", async () => {
    const request = post("x".repeat(200), { "Content-Type": "application/json", "Content-Length": "200" });
    await expect(readApiInput(request, { maxBytes: 100 })).rejects.toBeInstanceOf(PayloadTooLargeError);
    expect(request.bodyUsed).toBe(false);
  });

  it("takes a body of exactly the limit and refuses one byte more (boundary)", async () => {
    const exactly = JSON.stringify("x".repeat(98)); // 100 bytes with its quotes
    expect(await readApiInput(post(exactly, { "Content-Type": "application/json" }), { maxBytes: 100 })).toBe("x".repeat(98));
    const over = JSON.stringify("x".repeat(99));
    await expect(readApiInput(post(over, { "Content-Type": "application/json" }), { maxBytes: 100 })).rejects.toBeInstanceOf(PayloadTooLargeError);
  });

  it("cuts a chunked body off at the limit: an endless stream ends in a 413 after about limit ÷ chunk reads", async () => {
    // 1 MB in 64 KiB chunks: the 17th chunk crosses the limit; the stream may have queued one ahead.
    const { stream, pulled } = endlessBody(64 * 1024, 18);
    const request = new Request(URL_, { method: "POST", body: stream, headers: { "Content-Type": "application/json" }, duplex: "half" } as RequestInit);
    await expect(readApiInput(request)).rejects.toBeInstanceOf(PayloadTooLargeError);
    expect(pulled()).toBeLessThanOrEqual(18);
  });

  it("reads forms: a repeated name becomes a list, and a field named __proto__ stays a field", async () => {
    const form = new URLSearchParams([["cells", "B7"], ["cells", "C7"], ["hose", "Hose A"], ["__proto__", "polluted"]]);
    const input = (await readApiInput(post(form))) as Record<string, unknown>;
    expect(input.cells).toEqual(["B7", "C7"]);
    expect(input.hose).toBe("Hose A");
    expect(Object.getPrototypeOf(input)).toBe(Object.prototype);
    expect(Object.hasOwn(input, "__proto__")).toBe(true);
    const multipart = new FormData();
    multipart.set("name", "Embed");
    expect(await readApiInput(post(multipart))).toEqual({ name: "Embed" });
  });

  it("answers 400 for a multipart body that does not read", async () => {
    await expect(readApiInput(post("--nope\r\n", { "Content-Type": "multipart/form-data; boundary=x" }))).rejects.toBeInstanceOf(BadRequestError);
  });
});

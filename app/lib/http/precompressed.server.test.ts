import { gunzipSync } from "node:zlib";
import { describe, expect, it } from "vitest";
import { acceptsGzip, precompress, precompressedResponse } from "./precompressed.server";

const asking = (acceptEncoding?: string) => new Request("http://127.0.0.1/api/x", { headers: acceptEncoding === undefined ? {} : { "Accept-Encoding": acceptEncoding } });

describe("precompressed answers", () => {
  it("reads Accept-Encoding as RFC 9110 §12.5.3 words it: q=0 refuses, * stands for any other coding (published)", () => {
    expect(acceptsGzip(asking("gzip, deflate, br"))).toBe(true);
    expect(acceptsGzip(asking("br;q=1.0, gzip;q=0.5"))).toBe(true);
    expect(acceptsGzip(asking("gzip;q=0, br"))).toBe(false);
    expect(acceptsGzip(asking("*"))).toBe(true);
    expect(acceptsGzip(asking("*;q=0"))).toBe(false);
    expect(acceptsGzip(asking("gzip;q=0, *"))).toBe(false);
    expect(acceptsGzip(asking("identity"))).toBe(false);
    expect(acceptsGzip(asking())).toBe(false);
  });

  it("sends the gzip that inflates to the same text when gzip is taken, and the text when not", async () => {
    const text = JSON.stringify({ cells: Array.from({ length: 2000 }, (_, index) => index % 7) });
    const body = await precompress(text);
    const zipped = precompressedResponse(asking("gzip"), body, { "Content-Type": "application/json" });
    expect(zipped.headers.get("Content-Encoding")).toBe("gzip");
    expect(zipped.headers.get("Vary")).toBe("Accept-Encoding");
    const bytes = Buffer.from(await zipped.arrayBuffer());
    expect(Number(zipped.headers.get("Content-Length"))).toBe(bytes.length);
    expect(bytes.length).toBeLessThan(text.length);
    expect(gunzipSync(bytes).toString("utf8")).toBe(text);
    const plain = precompressedResponse(asking("identity"), body, { "Content-Type": "application/json" });
    expect(plain.headers.get("Content-Encoding")).toBeNull();
    expect(await plain.text()).toBe(text);
  });
});

import { describe, expect, it } from "vitest";
import { describeUserAgent } from "./user-agent";

// Typical User-Agent strings of current browsers, written from memory of their well-known formats
// (memory; the headless one is what the e2e Chromium here sends), each with the words a person
// would use for it.
describe("describeUserAgent", () => {
  it("names the common browsers and systems", () => {
    expect(describeUserAgent("Mozilla/5.0 (X11; Linux x86_64) AppleWebKit/537.36 (KHTML, like Gecko) HeadlessChrome/156.0.0.0 Safari/537.36")).toBe("Chrome on Linux");
    expect(describeUserAgent("Mozilla/5.0 (Linux; Android 14; Pixel 8) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/131.0.0.0 Mobile Safari/537.36")).toBe("Chrome on Android");
    expect(describeUserAgent("Mozilla/5.0 (iPhone; CPU iPhone OS 17_5 like Mac OS X) AppleWebKit/605.1.15 (KHTML, like Gecko) Version/17.5 Mobile/15E148 Safari/604.1")).toBe("Safari on iOS");
    expect(describeUserAgent("Mozilla/5.0 (Windows NT 10.0; Win64; x64) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/131.0.0.0 Safari/537.36 Edg/131.0.0.0")).toBe("Edge on Windows");
    expect(describeUserAgent("Mozilla/5.0 (Macintosh; Intel Mac OS X 14.5; rv:133.0) Gecko/20100101 Firefox/133.0")).toBe("Firefox on macOS");
  });

  it("says plainly when it cannot tell", () => {
    expect(describeUserAgent("")).toBe("A browser");
    expect(describeUserAgent("curl/8.5.0")).toBe("A program");
  });
});

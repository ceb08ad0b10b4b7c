import { describe, expect, it } from "vitest";
import { inRequestScope, oncePerRequest } from "./request-scope.server";

const request = (method: string) => new Request("http://127.0.0.1/projects/1", { method });

describe("one HTTP request's scope", () => {
  it("computes a reading request's lookup once for all its loaders, and again in the next request", async () => {
    let lookUps = 0;
    const lookUp = async () => ++lookUps;
    // Three loaders of one page load, each with a Request object of its own (as React Router gives them).
    const firstLoad = await inRequestScope(() => Promise.all([1, 2, 3].map(() => oncePerRequest(request("GET"), "session-user", lookUp))));
    expect(firstLoad).toEqual([1, 1, 1]);
    const nextLoad = await inRequestScope(async () => oncePerRequest(request("GET"), "session-user", lookUp));
    expect(nextLoad).toBe(2);
    expect(lookUps).toBe(2);
  });

  it("never reuses an answer for a request that changes something, nor outside a scope", async () => {
    let lookUps = 0;
    const lookUp = async () => ++lookUps;
    await inRequestScope(async () => {
      expect(await oncePerRequest(request("POST"), "project-1", lookUp)).toBe(1);
      expect(await oncePerRequest(request("POST"), "project-1", lookUp)).toBe(2);
      // The loaders that follow an action read afresh, then share.
      expect(await oncePerRequest(request("GET"), "project-1", lookUp)).toBe(3);
      expect(await oncePerRequest(request("GET"), "project-1", lookUp)).toBe(3);
    });
    expect(await oncePerRequest(request("GET"), "project-1", lookUp)).toBe(4);
    expect(await oncePerRequest(request("GET"), "project-1", lookUp)).toBe(5);
  });

  it("keeps different keys apart", async () => {
    const answers = await inRequestScope(async () => [
      await oncePerRequest(request("GET"), "project-1-of-7", async () => "one"),
      await oncePerRequest(request("GET"), "project-2-of-7", async () => "two"),
    ]);
    expect(answers).toEqual(["one", "two"]);
  });
});

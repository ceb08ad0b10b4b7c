import { describe, expect, it } from "vitest";
import { ConflictError, DomainError, ForbiddenError, NotFoundError, NotSignedInError, ValidationError } from "~/lib/errors";
import { BadRequestError, PayloadTooLargeError, PreconditionFailedError } from "~/lib/errors";
import { MethodNotAllowedError, UnsupportedMediaTypeError } from "./errors.server";
import { apiRoute } from "./route.server";

const args = (method: string) => ({ request: new Request("http://127.0.0.1/api/x", { method }) });

describe("apiRoute", () => {
  it("answers each typed error with its status and the one error shape", async () => {
    // Written out by hand: the statuses the README's HTTP API section documents.
    const cases: Array<[DomainError, number]> = [
      [new BadRequestError("b"), 400],
      [new NotSignedInError("s"), 401],
      [new ForbiddenError("f"), 403],
      [new NotFoundError({ field: "team", message: "n" }), 404],
      [new MethodNotAllowedError(["GET"]), 405],
      [new ConflictError("c", { conflicts: [{ cell: "B7", team: "Team Heron" }] }), 409],
      [new PreconditionFailedError({ field: "If-Match", message: "p" }, { current: { id: 4, status: "dewatering" } }), 412],
      [new PayloadTooLargeError("p"), 413],
      [new UnsupportedMediaTypeError("u"), 415],
      [new ValidationError([{ row: 4, column: "depth", value: "4.1x", message: "v" }]), 422],
      [new DomainError("plain"), 400],
    ];
    for (const [error, status] of cases) {
      const route = apiRoute({ GET: async () => { throw error; } });
      const response = await route.loader(args("GET"));
      expect(response.status, error.name).toBe(status);
      expect(response.headers.get("Content-Type")).toMatch(/^application\/json/);
      expect(await response.json()).toEqual({ errors: error.details, ...error.extra });
    }
  });

  it("asks a client without a credential for a bearer token (401)", async () => {
    const response = await apiRoute({ GET: async () => { throw new NotSignedInError("sign in"); } }).loader(args("GET"));
    expect(response.headers.get("WWW-Authenticate")).toBe('Bearer realm="Firmsand"');
  });

  it("answers a method it has no handler for with 405 and Allow, and HEAD with the GET handler", async () => {
    const route = apiRoute({ GET: async () => Response.json({ ok: true }), DELETE: async () => new Response(null, { status: 204 }) });
    const refused = await route.action(args("POST"));
    expect(refused.status).toBe(405);
    expect(refused.headers.get("Allow")).toBe("GET, DELETE");
    expect(await refused.json()).toEqual({ errors: [{ message: "Use GET or DELETE here." }] });
    expect((await route.action(args("DELETE"))).status).toBe(204);
    expect((await route.loader(args("HEAD"))).status).toBe(200);
  });

  it("leaves a fault of its own a fault (rethrown, so the server answers 500 and logs it)", async () => {
    const route = apiRoute({ GET: async () => { throw new TypeError("a bug"); } });
    await expect(route.loader(args("GET"))).rejects.toThrow("a bug");
  });
});

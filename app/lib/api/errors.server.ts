import { isDatabaseUnreachable } from "~/lib/db.server";
import { BadRequestError, ConflictError, DomainError, ForbiddenError, NotFoundError, NotSignedInError, PayloadTooLargeError, PreconditionFailedError, ServiceUnavailableError, TooManyRequestsError, ValidationError } from "~/lib/errors";

/**
 * The API's one error shape and the one map from error class to HTTP status. Every `/api` answer
 * that is not a success is
 *
 *   {"errors": [{"field"?, "row"?, "column"?, "value"?, "message"}], ...extra}
 *
 * with the status below; `extra` is data a client needs beside the messages (the conflicting
 * assignments of a 409, the blockers of a refused import).
 */

/** The body's Content-Type is not one the route reads. */
export class UnsupportedMediaTypeError extends DomainError {}

/** The route does not answer this method. */
export class MethodNotAllowedError extends DomainError {
  constructor(readonly allowed: readonly string[]) {
    super(`Use ${allowed.join(" or ")} here.`);
  }
}

// Thrown by models too (the file storage unreachable), so it lives with the other typed errors.
export { ServiceUnavailableError };

// Subclasses before their parents would matter here; these classes are all siblings.
const STATUS_BY_CLASS: ReadonlyArray<readonly [abstract new (...args: never[]) => DomainError, number]> = [
  [BadRequestError, 400],
  [NotSignedInError, 401],
  [ForbiddenError, 403],
  [NotFoundError, 404],
  [MethodNotAllowedError, 405],
  [ConflictError, 409],
  [PreconditionFailedError, 412],
  [PayloadTooLargeError, 413],
  [UnsupportedMediaTypeError, 415],
  [ValidationError, 422],
  [TooManyRequestsError, 429],
  [ServiceUnavailableError, 503],
];

/** The status for a typed error; a DomainError of no listed class is a plain 400. */
export function statusOf(error: DomainError): number {
  for (const [errorClass, status] of STATUS_BY_CLASS) if (error instanceof errorClass) return status;
  return 400;
}

/** The JSON answer for a typed error. */
export function apiErrorResponse(error: DomainError): Response {
  const status = statusOf(error);
  const headers = new Headers({ "Cache-Control": "no-store" });
  if (status === 401) headers.set("WWW-Authenticate", 'Bearer realm="Firmsand"');
  if (error instanceof MethodNotAllowedError) headers.set("Allow", error.allowed.join(", "));
  if (error instanceof ServiceUnavailableError) headers.set("Retry-After", String(error.retryAfterSeconds));
  return Response.json({ errors: error.details, ...error.extra }, { status, headers });
}

/**
 * A thrown value as the API's answer: typed errors in the error shape, Responses as they are, an
 * unreachable database as 503 in the same shape (logged: it is ours to fix, not the client's);
 * anything else is a fault and is rethrown (500).
 */
export function apiAnswerFor(thrown: unknown): Response {
  if (thrown instanceof DomainError) return apiErrorResponse(thrown);
  if (thrown instanceof Response) return thrown;
  if (isDatabaseUnreachable(thrown)) {
    console.error("Firmsand's database is unreachable:", thrown);
    return apiErrorResponse(new ServiceUnavailableError("Firmsand's database cannot be reached right now. Nothing was changed; try again in a minute."));
  }
  throw thrown;
}

import type { z } from "zod";

/**
 * The typed errors models and services throw when a request cannot be done, carrying what a
 * person needs to fix it. Models never build HTTP answers: routes turn these into responses (the
 * API layer maps class → status once, in app/lib/api/errors.server.ts; pages show the message).
 * Safe for browser code (no server imports).
 */

/** One problem: the form or JSON field it concerns, or the file's row and column, and the rule broken in plain words. */
export interface ErrorDetail {
  field?: string;
  row?: number | null;
  column?: string;
  /** The offending value as the client sent it (a CSV cell), when showing it helps. */
  value?: string;
  message: string;
}

export class DomainError extends Error {
  readonly details: ErrorDetail[];
  /** Data a client needs beside the messages (e.g. the conflicting assignments of a 409). */
  readonly extra: Record<string, unknown>;

  constructor(details: string | ErrorDetail | ErrorDetail[], extra: Record<string, unknown> = {}) {
    const list = typeof details === "string" ? [{ message: details }] : Array.isArray(details) ? details : [details];
    super(list.map((detail) => detail.message).join(" "));
    this.name = new.target.name;
    this.details = list;
    this.extra = extra;
  }
}

/** The input breaks a rule (a field, a row, a combination of values). */
export class ValidationError extends DomainError {}

/** A thing the request names does not exist in this project (a team, a survey, a link, a member). */
export class NotFoundError extends DomainError {}

/** The request contradicts what is already recorded (a cell assigned twice on one day, the last manager removed). */
export class ConflictError extends DomainError {}

/**
 * An edit made against a version of the record that is no longer the current one (its If-Match
 * names another version); `current` in extra holds the record as it is now, to show side by side.
 */
export class PreconditionFailedError extends DomainError {}

/** The project is archived: read-only until a site admin restores it (a 409: the request contradicts its state). */
export class ArchivedProjectError extends ConflictError {}

/** No credential, or one that names nobody (a revoked token, an expired session). */
export class NotSignedInError extends DomainError {}

/** The person is known but the permission table does not let their role do this. */
export class ForbiddenError extends DomainError {}

/** The request cannot be read: a body that is not what its Content-Type says, a query string that is not what the route asks. */
export class BadRequestError extends DomainError {}

/** The body is larger than the route accepts (refused on its declared length, or cut off at the limit). */
export class PayloadTooLargeError extends DomainError {}

/** Too many requests of this kind from this client for now; the message says when to try again. */
export class TooManyRequestsError extends DomainError {}

/**
 * Firmsand cannot answer right now: a service it depends on (the database, the file storage) is
 * unreachable. Nothing was changed; the client may try again after `retryAfterSeconds`.
 */
export class ServiceUnavailableError extends DomainError {
  constructor(details: string | ErrorDetail | ErrorDetail[], readonly retryAfterSeconds = 30) {
    super(details);
  }
}

/** A zod failure's issues as details, each named by its path (none for the input as a whole). */
export function detailsOf(error: z.ZodError): ErrorDetail[] {
  return error.issues.map((issue) => {
    const field = issue.path.map(String).join(".");
    return field ? { field, message: issue.message } : { message: issue.message };
  });
}

/** A zod failure as a ValidationError. */
export function validationErrorFrom(error: z.ZodError): ValidationError {
  return new ValidationError(detailsOf(error));
}

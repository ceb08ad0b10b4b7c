// Form parsing and the field rules shared by several forms (client-safe: no server imports).
import { z } from "zod";
import type { ErrorDetail } from "../errors";

// bcrypt reads at most 72 bytes of a password, so longer ones are refused rather than cut.
export const PASSWORD_MIN_LENGTH = 10;
export const PASSWORD_MAX_BYTES = 72;

export type FieldErrors = Record<string, string>;

/** Parses a submitted form with a zod schema; errors come back per field, first message each. */
export function parseForm<Schema extends z.ZodType>(formData: FormData, schema: Schema):
  | { ok: true; data: z.infer<Schema> }
  | { ok: false; errors: FieldErrors } {
  const result = schema.safeParse(Object.fromEntries(formData));
  if (result.success) return { ok: true, data: result.data };
  const errors: FieldErrors = {};
  for (const issue of result.error.issues) {
    const key = String(issue.path[0] ?? "form");
    errors[key] ??= issue.message;
  }
  return { ok: false, errors };
}

/**
 * A service's refusal (its ErrorDetail list) as a form's field errors: `inputOf` names the form
 * input a detail's field belongs to; details without a field, and several on one input, are joined.
 */
export function fieldErrorsFrom(details: readonly ErrorDetail[], inputOf: (field: string) => string): FieldErrors {
  const errors: FieldErrors = {};
  for (const detail of details) {
    const key = detail.field ? inputOf(detail.field) : "form";
    errors[key] = errors[key] ? `${errors[key]} ${detail.message}` : detail.message;
  }
  return errors;
}

export const newPasswordSchema = z
  .string()
  .min(PASSWORD_MIN_LENGTH, `Use at least ${PASSWORD_MIN_LENGTH} characters.`)
  .refine((value) => new TextEncoder().encode(value).length <= PASSWORD_MAX_BYTES, `Use at most ${PASSWORD_MAX_BYTES} bytes.`);

export const personNameSchema = z.string().trim().min(1, "Enter your name.").max(120, "Use at most 120 characters.");

export const emailSchema = z.string().trim().min(1, "Enter an e-mail address.").max(254).email("Enter an e-mail address like name@example.org.");

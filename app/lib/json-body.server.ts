import type { z } from "zod";

/**
 * An API action's JSON body checked with its zod schema: the parsed input, or the `400` answer
 * that names every problem as `field: message` (and says so when the body is not JSON at all).
 */
export async function readJsonInput<Schema extends z.ZodType>(request: Request, schema: Schema): Promise<{ data: z.output<Schema> } | { response: Response }> {
  let body: unknown;
  try {
    body = await request.json();
  } catch {
    return { response: Response.json({ error: "The request body must be JSON." }, { status: 400 }) };
  }
  const input = schema.safeParse(body);
  if (!input.success) {
    return { response: Response.json({ error: input.error.issues.map((issue) => `${issue.path.join(".") || "body"}: ${issue.message}`).join("; ") }, { status: 400 }) };
  }
  return { data: input.data };
}

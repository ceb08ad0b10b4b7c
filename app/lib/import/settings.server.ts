import { resolve } from "node:path";
import { z } from "zod";

// Upload settings, parsed once with zod. UPLOAD_DIR is where staged sounding files wait between
// upload and commit (default .data/uploads, git-ignored).
const schema = z.object({
  UPLOAD_DIR: z.string().min(1).default(resolve(process.cwd(), ".data", "uploads")),
  /** Largest sounding file accepted, bytes (200 MB). */
  UPLOAD_MAX_BYTES: z.coerce.number().int().positive().default(200 * 1024 * 1024),
  /** Hours an upload may wait unimported (untouched) before its staged file is removed: 1 hour to 90 days. */
  UPLOAD_RETENTION_HOURS: z.coerce
    .number({ message: "UPLOAD_RETENTION_HOURS must be a number of hours" })
    .min(1, "UPLOAD_RETENTION_HOURS must be at least 1 hour")
    .max(90 * 24, "UPLOAD_RETENTION_HOURS must be at most 2160 hours (90 days)")
    .default(24),
});

let parsed: z.infer<typeof schema> | undefined;

export function uploadSettings() {
  parsed ??= schema.parse(process.env);
  return parsed;
}

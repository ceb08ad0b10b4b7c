import { getUploadEnv } from "../settings/env.server";

/**
 * The upload settings, parsed with the rest of Firmsand's environment (app/lib/env.server.ts):
 * UPLOAD_DIR (staged files, default .data/uploads), UPLOAD_MAX_BYTES (200 MB) and
 * UPLOAD_RETENTION_HOURS (24: unimported uploads older than this are removed).
 */
export function uploadSettings() {
  return getUploadEnv();
}

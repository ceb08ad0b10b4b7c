import { readFile, readdir } from "node:fs/promises";
import { join } from "node:path";
import { z } from "zod";
import { getEnv } from "~/lib/settings/env.server";

// The fake SMTP server's mailbox (demo and tests only): one JSON file per received message.
const messageSchema = z.object({
  id: z.string(),
  receivedAt: z.string(),
  envelopeTo: z.array(z.string()).default([]),
  from: z.string().nullable().default(null),
  to: z.string().nullable().default(null),
  subject: z.string().default(""),
  text: z.string().default(""),
  attachments: z.array(z.object({ filename: z.string().nullable(), contentType: z.string(), size: z.number(), sha256: z.string() })).default([]),
});
export type MailboxMessage = z.infer<typeof messageSchema>;

const ID_PATTERN = /^[A-Za-z0-9-]{1,80}$/;

export async function listMailboxMessages(): Promise<MailboxMessage[]> {
  const dir = getEnv().MAILBOX_DIR;
  let files: string[];
  try {
    files = (await readdir(dir)).filter((file) => file.endsWith(".json"));
  } catch {
    return [];
  }
  const messages: MailboxMessage[] = [];
  for (const file of files) {
    const parsed = messageSchema.safeParse(JSON.parse(await readFile(join(dir, file), "utf8")));
    if (parsed.success) messages.push(parsed.data);
  }
  return messages.sort((a, b) => b.receivedAt.localeCompare(a.receivedAt) || b.id.localeCompare(a.id));
}

export async function getMailboxMessage(id: string): Promise<MailboxMessage | null> {
  if (!ID_PATTERN.test(id)) return null;
  try {
    const parsed = messageSchema.safeParse(JSON.parse(await readFile(join(getEnv().MAILBOX_DIR, `${id}.json`), "utf8")));
    return parsed.success ? parsed.data : null;
  } catch {
    return null;
  }
}

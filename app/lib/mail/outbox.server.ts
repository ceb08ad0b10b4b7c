import { Op, type Transaction } from "sequelize";
import { OutgoingMail, type MailAttachment, type OutgoingMailStatus } from "~/lib/db.server";
import { getObject } from "~/lib/storage/storage.server";
import { transportMail, type MailMessage } from "./mail.server";

/**
 * The one way Firmsand sends mail: `queueMail` writes the message to the outbox in the caller's
 * transaction, so the record and its mail are kept together or not at all, and a delivery loop
 * sends it over SMTP after the commit, retrying with growing pauses while the server is down.
 * The request never waits for SMTP: an action answers the same whether or not a mail goes out
 * (the forgot-password page relies on that) and succeeds while the mail server is away.
 */

export interface QueuedMail extends Omit<MailMessage, "attachments"> {
  /** What the mail belongs to ("invitation:12"), so a page can say it is not sent yet. */
  ref?: string;
  /**
   * Files to attach, named by their object-storage keys (app/lib/storage): the caller stores the
   * file first; the delivery loop reads it when it sends, so the outbox row stays small. A key
   * with no object is a failed attempt, retried like an SMTP refusal.
   */
  attachments?: MailAttachment[];
}

/** Pauses before the 2nd, 3rd… attempt; the last is repeated until MAX_ATTEMPTS. */
const RETRY_PAUSES_SECONDS = [15, 60, 300, 900, 1800];
export const MAX_ATTEMPTS = 12;
/** A claimed mail is left alone this long by other processes while one sends it. */
const CLAIM_SECONDS = 120;
const BATCH = 20;
const POLL_SECONDS = 5;

/** The delivery loop's timer: set once the server has started it. */
let timer: NodeJS.Timeout | null = null;

export async function queueMail(mail: QueuedMail, transaction?: Transaction): Promise<void> {
  await OutgoingMail.create(
    { toAddress: mail.to, subject: mail.subject.slice(0, 300), bodyText: mail.text, ref: mail.ref ?? null, attachments: mail.attachments?.length ? mail.attachments : null, nextAttemptAt: new Date() },
    { transaction },
  );
  // Sent once the record is committed, never before (a rolled-back invitation sends nothing), by
  // the server's delivery loop; scripts and tests that start no loop deliver with deliverDue.
  if (!timer) return;
  if (transaction) transaction.afterCommit(() => deliverSoon());
  else deliverSoon();
}

let pending: Promise<number> | null = null;
let again = false;

/**
 * Starts a delivery round after the current work, unless one is running (then one more follows
 * it, so a mail queued during a round is not left for the poll).
 */
export function deliverSoon(): void {
  if (pending) {
    again = true;
    return;
  }
  pending = (async () => {
    let sent = 0;
    do {
      again = false;
      sent += await deliverDue().catch((error: unknown) => {
        process.stderr.write(`Firmsand: the mail outbox could not be read: ${(error as Error).message}\n`);
        return 0;
      });
    } while (again);
    return sent;
  })().finally(() => {
    pending = null;
  });
}

/** Resolves when the current delivery round (if any) is done: for tests and shutdown. */
export async function deliveryIdle(): Promise<void> {
  while (pending) await pending;
}

function pauseAfter(attempts: number): number {
  return RETRY_PAUSES_SECONDS[Math.min(attempts, RETRY_PAUSES_SECONDS.length) - 1] * 1000;
}

/**
 * Sends the mails that are due, oldest first; returns how many went out. Each mail is claimed
 * first (its next attempt moved ahead, guarded by the value read), so two processes never send it twice.
 */
export async function deliverDue(now = new Date(), send: (mail: MailMessage) => Promise<void> = transportMail): Promise<number> {
  const due = await OutgoingMail.findAll({
    where: { status: "pending", nextAttemptAt: { [Op.lte]: now } },
    order: [["nextAttemptAt", "ASC"], ["id", "ASC"]],
    limit: BATCH,
  });
  let sent = 0;
  for (const mail of due) {
    const [claimed] = await OutgoingMail.update(
      { nextAttemptAt: new Date(now.getTime() + CLAIM_SECONDS * 1000) },
      { where: { id: mail.id, status: "pending", nextAttemptAt: mail.nextAttemptAt } },
    );
    if (claimed !== 1) continue;
    const attempts = mail.attempts + 1;
    try {
      await send({ to: mail.toAddress, subject: mail.subject, text: mail.bodyText, attachments: await attachmentsOf(mail.attachments ?? []) });
      await OutgoingMail.update({ status: "sent", attempts, sentAt: new Date(), lastError: null }, { where: { id: mail.id } });
      sent++;
    } catch (error) {
      const gaveUp = attempts >= MAX_ATTEMPTS;
      await OutgoingMail.update(
        {
          status: gaveUp ? "failed" : "pending",
          attempts,
          lastError: String((error as Error).message ?? error).slice(0, 500),
          nextAttemptAt: new Date(now.getTime() + pauseAfter(attempts)),
        },
        { where: { id: mail.id } },
      );
    }
  }
  return sent;
}

/** The stored files a mail carries, read from storage; a missing object fails the attempt. */
async function attachmentsOf(attachments: readonly MailAttachment[]): Promise<NonNullable<MailMessage["attachments"]>> {
  const files: NonNullable<MailMessage["attachments"]> = [];
  for (const attachment of attachments) {
    const stored = await getObject(attachment.storageKey);
    if (!stored) throw new Error(`the attachment ${attachment.filename} is not in storage (${attachment.storageKey})`);
    files.push({ filename: attachment.filename, contentType: attachment.contentType, content: stored.bytes });
  }
  return files;
}

export interface MailState {
  status: OutgoingMailStatus;
  attempts: number;
  lastError: string | null;
}

/** The newest mail's state for each ref given (refs with no mail are absent). */
export async function mailStates(refs: readonly string[]): Promise<Map<string, MailState>> {
  const states = new Map<string, MailState>();
  if (refs.length === 0) return states;
  const mails = await OutgoingMail.findAll({ where: { ref: [...refs] }, order: [["id", "ASC"]] });
  for (const mail of mails) states.set(mail.ref!, { status: mail.status, attempts: mail.attempts, lastError: mail.lastError });
  return states;
}

/** Polls the outbox every few seconds (unref'd, so it never keeps a process alive). Started by the production server. */
export function startMailDelivery(): void {
  if (timer) return;
  deliverSoon();
  timer = setInterval(deliverSoon, POLL_SECONDS * 1000);
  timer.unref();
}

// The production server (app/serve.mjs) starts the background tasks the app registers on load.
const registry = globalThis as typeof globalThis & { firmsandBackgroundTasks?: Array<() => void> };
(registry.firmsandBackgroundTasks ??= []).push(startMailDelivery);

import nodemailer, { type Transporter } from "nodemailer";
import { getEnv } from "../settings/env.server";

// The SMTP side of the outbox: SMTP_HOST:SMTP_PORT (in demo and tests, the local fake SMTP server
// that stores each message for /dev/mail and the tests). Features queue mail with `queueMail`
// (outbox.server.ts); only the outbox's delivery loop calls `transportMail`.

let transporter: Transporter | undefined;

function getTransporter(): Transporter {
  if (!transporter) {
    const env = getEnv();
    transporter = nodemailer.createTransport({
      host: env.SMTP_HOST,
      port: env.SMTP_PORT,
      secure: false,
      // The local fake server offers no TLS; a hosted relay on port 587 upgrades with STARTTLS.
      ignoreTLS: env.SMTP_HOST === "127.0.0.1" || env.SMTP_HOST === "localhost",
      connectionTimeout: 5_000,
    });
  }
  return transporter;
}

export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  attachments?: Array<{ filename: string; contentType: string; content: Buffer }>;
}

export async function transportMail(mail: MailMessage): Promise<void> {
  await getTransporter().sendMail({ from: getEnv().MAIL_FROM, to: mail.to, subject: mail.subject, text: mail.text, attachments: mail.attachments ?? [] });
}

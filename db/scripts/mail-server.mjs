// A local stand-in for a hosted mail service: an SMTP server on 127.0.0.1 that accepts every
// message and stores it as JSON in a mailbox directory, one file per message, where the demo's
// /dev/mail page and the tests read it.
//   node db/scripts/mail-server.mjs <port> <mailbox-dir>
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { createHash, randomUUID } from "node:crypto";
import { SMTPServer } from "smtp-server";
import { simpleParser } from "mailparser";

const port = Number(process.argv[2] ?? 2525);
const mailbox = process.argv[3];
if (!mailbox) {
  process.stderr.write("usage: mail-server.mjs <port> <mailbox-dir>\n");
  process.exit(2);
}
mkdirSync(mailbox, { recursive: true });

const server = new SMTPServer({
  authOptional: true,
  disabledCommands: ["STARTTLS"],
  logger: false,
  size: 10 * 1024 * 1024,
  onData(stream, session, callback) {
    simpleParser(stream)
      .then((parsed) => {
        const receivedAt = new Date();
        const id = `${receivedAt.getTime()}-${randomUUID().slice(0, 8)}`;
        const message = {
          id,
          receivedAt: receivedAt.toISOString(),
          envelopeFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
          envelopeTo: session.envelope.rcptTo.map((recipient) => recipient.address),
          from: parsed.from?.text ?? null,
          to: parsed.to ? [parsed.to].flat().map((address) => address.text).join(", ") : null,
          subject: parsed.subject ?? "",
          text: parsed.text ?? "",
          html: typeof parsed.html === "string" ? parsed.html : null,
          // What each attached file is (name, type, size, SHA-256), not its bytes.
          attachments: (parsed.attachments ?? []).map((file) => ({
            filename: file.filename ?? null, contentType: file.contentType, size: file.size, sha256: createHash("sha256").update(file.content).digest("hex"),
          })),
        };
        mkdirSync(mailbox, { recursive: true }); // someone may have emptied it meanwhile
        writeFileSync(join(mailbox, `${id}.json`), JSON.stringify(message, null, 2));
        callback();
      })
      .catch((error) => callback(error));
  },
});

server.on("error", (error) => process.stderr.write(`fake SMTP: ${error.message}\n`));
server.listen(port, "127.0.0.1", () => {
  process.stderr.write(`fake SMTP listening on 127.0.0.1:${port}, mailbox ${mailbox}\n`);
});

for (const signal of ["SIGTERM", "SIGINT"]) {
  process.on(signal, () => server.close(() => process.exit(0)));
}

import { Link } from "react-router";
import { requireDemoMailbox } from "~/lib/mail/demo-mailbox.server";
import { getMailboxMessage } from "~/lib/mail/mailbox.server";
import type { Route } from "./+types/dev.mail.$messageId";

export async function loader({ request, params }: Route.LoaderArgs) {
  await requireDemoMailbox(request);
  const message = await getMailboxMessage(params.messageId);
  if (!message) throw new Response("There is no such message in the mailbox.", { status: 404, statusText: "Not Found" });
  return { message: { subject: message.subject, from: message.from, to: message.to ?? message.envelopeTo.join(", "), receivedAt: message.receivedAt, text: message.text } };
}

export default function DevMailMessage({ loaderData }: Route.ComponentProps) {
  const { message } = loaderData;
  return (
    <article aria-labelledby="message-subject" className="mt-6 rounded border border-line bg-panel p-4">
      <h2 id="message-subject" className="text-lg font-semibold">{message.subject}</h2>
      <dl className="mt-2 text-sm">
        <div><dt className="inline text-muted">From: </dt><dd className="inline">{message.from}</dd></div>
        <div><dt className="inline text-muted">To: </dt><dd className="inline">{message.to}</dd></div>
        <div><dt className="inline text-muted">Received: </dt><dd className="inline">{message.receivedAt}</dd></div>
      </dl>
      <pre className="mt-4 whitespace-pre-wrap text-sm">{message.text}</pre>
      <p className="mt-4"><Link className="text-lagoon underline" to="/dev/mail">Close</Link></p>
    </article>
  );
}

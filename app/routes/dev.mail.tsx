import { Link, Outlet } from "react-router";
import { Page } from "~/components/page";
import { requireDemoMailbox } from "~/lib/mail/demo-mailbox.server";
import { listMailboxMessages } from "~/lib/mail/mailbox.server";
import type { Route } from "./+types/dev.mail";

export async function loader({ request }: Route.LoaderArgs) {
  await requireDemoMailbox(request);
  const messages = await listMailboxMessages();
  return { messages: messages.map((m) => ({ id: m.id, receivedAt: m.receivedAt, to: m.to ?? m.envelopeTo.join(", "), subject: m.subject })) };
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Demo mailbox · Firmsand" }];
}

export default function DevMail({ loaderData }: Route.ComponentProps) {
  return (
    <Page title="Demo mailbox" wide>
      <p className="text-sm text-muted">Messages the app sent, as captured by the local fake SMTP server. Newest first.</p>
      {loaderData.messages.length === 0 ? (
        <p className="mt-4 rounded border border-dashed border-line bg-panel p-6 text-muted">No messages yet.</p>
      ) : (
        <ul className="mt-4 divide-y divide-line rounded border border-line bg-panel">
          {loaderData.messages.map((message) => (
            <li key={message.id} className="p-3">
              <Link className="font-medium text-lagoon underline-offset-2 hover:underline" to={`/dev/mail/${message.id}`}>{message.subject || "(no subject)"}</Link>
              <p className="text-sm text-muted">to {message.to} · <time dateTime={message.receivedAt}>{message.receivedAt.replace("T", " ").slice(0, 19)} UTC</time></p>
            </li>
          ))}
        </ul>
      )}
      <Outlet />
    </Page>
  );
}

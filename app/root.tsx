import { Link, Links, Meta, Outlet, Scripts, ScrollRestoration, isRouteErrorResponse, useRouteLoaderData } from "react-router";
import type { Route } from "./+types/root";
import { getOptionalUser } from "./lib/auth/access.server";
import { applyFramePolicy } from "./lib/http/frame-policy.server";
import { assertSameOrigin } from "./lib/http/origin.server";
import { inRequestScope } from "./lib/http/request-scope.server";
import { SiteMenu } from "./components/site-menu";
import "./app.css";

// Every mutating request (any route, any form) passes this Origin check first; every response
// leaves with the framing policy (only the public share page may be framed).
export const middleware: Route.MiddlewareFunction[] = [
  async ({ request }, next) => {
    assertSameOrigin(request);
    // The request's scope: its loaders look up the session, user and project once between them.
    return applyFramePolicy(await inRequestScope(next));
  },
];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await getOptionalUser(request);
  return { user: user ? { id: user.id, name: user.name, email: user.email, isSiteAdmin: user.isSiteAdmin } : null };
}

function SiteHeader() {
  const data = useRouteLoaderData<typeof loader>("root");
  const user = data?.user;
  return (
    <header className="border-b border-line bg-panel">
      <div className="mx-auto flex max-w-5xl items-center gap-3 px-4 py-3 sm:gap-4 sm:px-6">
        <Link to={user ? "/projects" : "/"} className="font-semibold text-lagoon-dark focus-visible:outline-2 focus-visible:outline-lagoon">Firmsand</Link>
        {user ? (
          <SiteMenu user={user} />
        ) : (
          <nav aria-label="Account" className="ml-auto text-sm">
            <Link className="underline" to="/login">Sign in</Link>
          </nav>
        )}
      </div>
    </header>
  );
}

export function Layout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <link rel="icon" href="/favicon.svg" type="image/svg+xml" />
        <Meta />
        <Links />
      </head>
      <body className="min-h-screen font-sans antialiased">
        <SiteHeader />
        {children}
        <ScrollRestoration />
        <Scripts />
      </body>
    </html>
  );
}

export default function App() {
  return <Outlet />;
}

const statusText: Record<number, string> = {
  401: "Please sign in to see this page.",
  403: "Your role on this project does not allow this page.",
  404: "There is nothing at this address.",
};

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  let title = "Something went wrong";
  let detail = "An unexpected error occurred. The details are in the server log.";
  let status: number | undefined;
  if (isRouteErrorResponse(error)) {
    status = error.status;
    title = `${error.status} ${error.statusText || ""}`.trim();
    detail = typeof error.data === "string" && error.data ? error.data : statusText[error.status] ?? detail;
  } else if (import.meta.env.DEV && error instanceof Error) {
    detail = error.message;
  }
  return (
    <main className="mx-auto max-w-xl p-8" data-status={status}>
      <h1 className="text-2xl font-semibold">{title}</h1>
      <p className="mt-3 text-muted">{detail}</p>
      <p className="mt-6"><a className="text-lagoon underline" href="/projects">Back to your projects</a></p>
    </main>
  );
}

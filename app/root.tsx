import { Links, Meta, Outlet, Scripts, ScrollRestoration, isRouteErrorResponse } from "react-router";
import type { Route } from "./+types/root";
import "./app.css";

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

import { createCookieSessionStorage, redirect, type Session } from "react-router";
import { getEnv } from "../settings/env.server";
import { appOrigin } from "../http/origin.server";

// One cookie session for the whole app. The cookie is HttpOnly and SameSite=Lax always, and
// Secure except on plain http to a loopback address or outside production (browsers drop
// Secure cookies sent over http, which would make sign-in impossible in local runs).

export interface SessionData {
  userId: number;
  signedInAt: string;
}
// No flash messages: pages say what happened through their action data or the URL.
type SessionFlash = Record<string, never>;
type AppSession = Session<SessionData, SessionFlash>;

const LOOPBACK = new Set(["127.0.0.1", "localhost", "[::1]", "::1"]);
const storages = new Map<boolean, ReturnType<typeof createCookieSessionStorage<SessionData, SessionFlash>>>();

function isSecureRequest(request: Request): boolean {
  const url = new URL(request.url);
  if (url.protocol === "https:") return true;
  if (LOOPBACK.has(url.hostname)) return false;
  return getEnv().NODE_ENV === "production";
}

function storageFor(request: Request) {
  const secure = isSecureRequest(request);
  let storage = storages.get(secure);
  if (!storage) {
    storage = createCookieSessionStorage<SessionData, SessionFlash>({
      cookie: {
        name: "firmsand_session",
        httpOnly: true,
        sameSite: "lax",
        secure,
        path: "/",
        maxAge: 60 * 60 * 24 * 14,
        secrets: [getEnv().SESSION_SECRET],
      },
    });
    storages.set(secure, storage);
  }
  return storage;
}

export function getSession(request: Request): Promise<AppSession> {
  return storageFor(request).getSession(request.headers.get("Cookie"));
}

export function commitSession(request: Request, session: AppSession): Promise<string> {
  return storageFor(request).commitSession(session);
}

export function destroySession(request: Request, session: AppSession): Promise<string> {
  return storageFor(request).destroySession(session);
}

/** Starts a fresh session for the user and redirects to `to`. */
export async function signIn(request: Request, userId: number, to: string) {
  const session = await storageFor(request).getSession();
  session.set("userId", userId);
  session.set("signedInAt", new Date().toISOString());
  return redirect(to, { headers: { "Set-Cookie": await commitSession(request, session) } });
}

/**
 * Only a path of Firmsand's own is followed after sign-in (no open redirect): `next` must be
 * printable ASCII (a browser drops tabs and line breaks from a Location, and a header cannot carry
 * them at all), start with a single `/`, and still be on the app's origin once parsed as a URL
 * against it. Anything else goes to `fallback`.
 */
export function safeNext(next: unknown, fallback = "/projects"): string {
  if (typeof next !== "string" || !/^\/(?![/\\])[\x21-\x7e]*$/.test(next)) return fallback;
  let url: URL;
  try {
    url = new URL(next, appOrigin());
  } catch {
    return fallback;
  }
  const path = url.pathname + url.search + url.hash;
  if (url.origin !== appOrigin() || !/^\/(?![/\\])/.test(path)) return fallback;
  return path;
}

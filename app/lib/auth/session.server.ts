import { createHash, randomBytes } from "node:crypto";
import { createCookieSessionStorage, redirect, type Session } from "react-router";
import { Op, type Transaction } from "sequelize";
import { SignInSession } from "~/lib/db.server";
import { clientAddress } from "../http/client-address.server";
import { getEnv } from "../settings/env.server";
import { appOrigin, isSecureRequest } from "../http/origin.server";
import { rememberDevice } from "./known-device.server";
import { BoundedCache } from "../cache/bounded-cache";

// One cookie session for the whole app. The cookie is HttpOnly and SameSite=Lax always, and
// Secure except on plain http to a loopback address or outside production (browsers drop
// Secure cookies sent over http, which would make sign-in impossible in local runs).
//
// The cookie carries only a random session token; the session itself is a row of
// sign_in_sessions (the token's SHA-256, when it was last used, when it ends), so Firmsand can end
// it: signing out ends this one, a password change the user's others, a reset all of them.

export interface SessionData {
  sessionToken: string;
}
// No flash messages: pages say what happened through their action data or the URL.
type SessionFlash = Record<string, never>;
type AppSession = Session<SessionData, SessionFlash>;

const storages = new Map<boolean, ReturnType<typeof createCookieSessionStorage<SessionData, SessionFlash>>>();
/** lastSeenAt is written at most this often per session, so reading a page does not write each time. */
const TOUCH_EVERY_MS = 60_000;


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
        maxAge: 60 * 60 * 24 * getEnv().SESSION_MAX_DAYS,
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

// The session token of a Cookie header seen before. Checking the cookie's signature (an HMAC
// through Web Crypto) cost about a twentieth of a signed-in read's time under load; the same
// header with the same secret always gives the same token, so a bounded cache remembers it. The
// session row is still read on every request, so ending a session takes effect at once.
const tokensByCookieHeader = new BoundedCache<string | null>(2_000);
/** Longer headers are checked each time, so the cache stays within about 8 MB. */
const COOKIE_HEADER_REMEMBERED_UP_TO = 4_096;

function sessionToken(request: Request): Promise<string | null> {
  const header = request.headers.get("Cookie");
  if (!header) return Promise.resolve(null);
  const read = async () => {
    const token = (await getSession(request)).get("sessionToken");
    return typeof token === "string" && token.length > 0 ? token : null;
  };
  const key = `${isSecureRequest(request) ? "s" : "p"}|${header}`;
  return key.length > COOKIE_HEADER_REMEMBERED_UP_TO ? read() : tokensByCookieHeader.getOrCompute(key, read);
}

export function commitSession(request: Request, session: AppSession): Promise<string> {
  return storageFor(request).commitSession(session);
}

export function destroySession(request: Request, session: AppSession): Promise<string> {
  return storageFor(request).destroySession(session);
}

function hashSessionToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

export type SessionEndReason = "signed-out" | "password-changed" | "password-reset" | "signed-out-elsewhere" | "account-disabled";

/** The request's live session row: not ended, used within the idle limit, before its absolute end. */
export async function currentSignInSession(request: Request, now = new Date()): Promise<SignInSession | null> {
  const token = await sessionToken(request);
  if (token === null) return null;
  const row = await SignInSession.findOne({ where: { tokenHash: hashSessionToken(token), endedAt: null } });
  if (!row) return null;
  const idleSince = now.getTime() - getEnv().SESSION_IDLE_HOURS * 3600_000;
  if (row.expiresAt.getTime() <= now.getTime() || row.lastSeenAt.getTime() <= idleSince) return null;
  if (now.getTime() - row.lastSeenAt.getTime() >= TOUCH_EVERY_MS) {
    await SignInSession.update({ lastSeenAt: now }, { where: { id: row.id, endedAt: null } });
    row.lastSeenAt = now;
  }
  return row;
}

/** Starts a fresh session for the user (a new server-side row) and redirects to `to`. */
export async function signIn(request: Request, userId: number, to: string) {
  const token = randomBytes(32).toString("base64url");
  const now = new Date();
  await SignInSession.create({
    userId,
    tokenHash: hashSessionToken(token),
    userAgent: (request.headers.get("User-Agent") ?? "").slice(0, 300),
    ip: clientAddress(request),
    lastSeenAt: now,
    expiresAt: new Date(now.getTime() + getEnv().SESSION_MAX_DAYS * 24 * 3600_000),
  });
  const session = await storageFor(request).getSession();
  session.set("sessionToken", token);
  // The browser is remembered for this account, so the sign-in throttle spares it later.
  const headers = new Headers();
  headers.append("Set-Cookie", await commitSession(request, session));
  headers.append("Set-Cookie", await rememberDevice(request, userId));
  return redirect(to, { headers });
}

/** Ends the request's own session (signing out) and returns the cookie that clears it. */
export async function signOut(request: Request): Promise<string> {
  const current = await currentSignInSession(request);
  if (current) await endSessions(current.userId, "signed-out", { only: current.id });
  return destroySession(request, await getSession(request));
}

/**
 * Ends a user's open sessions: all of them, all but `except` (a password change keeps the
 * browser that made it), or `only` one. Returns how many ended.
 */
export async function endSessions(userId: number, reason: SessionEndReason, options: { except?: number | null; only?: number; transaction?: Transaction } = {}): Promise<number> {
  const where = {
    userId,
    endedAt: null,
    ...(options.only !== undefined ? { id: options.only } : options.except ? { id: { [Op.ne]: options.except } } : {}),
  };
  const [ended] = await SignInSession.update({ endedAt: new Date(), endedReason: reason }, { where, transaction: options.transaction });
  return ended;
}

export interface SessionView {
  id: number;
  startedAt: string;
  lastSeenAt: string;
  userAgent: string;
  current: boolean;
}

/** The user's live sessions, newest use first, the request's own marked. */
export async function listSessions(userId: number, request: Request): Promise<SessionView[]> {
  const now = new Date();
  const current = await currentSignInSession(request, now);
  const rows = await SignInSession.findAll({
    where: {
      userId,
      endedAt: null,
      expiresAt: { [Op.gt]: now },
      lastSeenAt: { [Op.gt]: new Date(now.getTime() - getEnv().SESSION_IDLE_HOURS * 3600_000) },
    },
    order: [["lastSeenAt", "DESC"]],
  });
  return rows.map((row) => ({ id: row.id, startedAt: row.createdAt.toISOString(), lastSeenAt: row.lastSeenAt.toISOString(), userAgent: row.userAgent, current: row.id === current?.id }));
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

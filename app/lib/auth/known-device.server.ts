import { createCookie } from "react-router";
import { z } from "zod";
import { isSecureRequest } from "../http/origin.server";
import { getEnv } from "../settings/env.server";

/**
 * A browser where an account has signed in before keeps a signed cookie naming that account.
 * The sign-in throttle spares such a browser: five wrong passwords typed by someone else lock
 * the account against strangers, not against its owner on their usual laptop or phone, and an
 * office behind one proxy address is not shut out by one colleague's typos. The cookie proves
 * only that the account signed in here before (it is signed with SESSION_SECRET, so it cannot be
 * made up); the password is still checked every time.
 */
const DEVICE_COOKIE_DAYS = 365;
/** The most accounts one browser remembers (a shared office computer), newest kept. */
const MAX_ACCOUNTS = 8;

const deviceSchema = z.object({ accounts: z.array(z.number().int().positive()).max(MAX_ACCOUNTS) });

const cookies = new Map<boolean, ReturnType<typeof createCookie>>();

function deviceCookie(secure: boolean) {
  let cookie = cookies.get(secure);
  if (!cookie) {
    cookie = createCookie("firmsand_device", {
      httpOnly: true, sameSite: "lax", secure, path: "/", maxAge: DEVICE_COOKIE_DAYS * 24 * 3600, secrets: [getEnv().SESSION_SECRET],
    });
    cookies.set(secure, cookie);
  }
  return cookie;
}

async function accountsOf(request: Request): Promise<number[]> {
  const parsed = deviceSchema.safeParse(await deviceCookie(isSecureRequest(request)).parse(request.headers.get("Cookie")).catch(() => null));
  return parsed.success ? parsed.data.accounts : [];
}

/** Whether `userId` has signed in from this browser before. */
export async function isKnownDevice(request: Request, userId: number): Promise<boolean> {
  return (await accountsOf(request)).includes(userId);
}

/** The Set-Cookie that remembers `userId` on this browser (after a successful sign-in). */
export async function rememberDevice(request: Request, userId: number): Promise<string> {
  const accounts = [userId, ...(await accountsOf(request)).filter((id) => id !== userId)].slice(0, MAX_ACCOUNTS);
  return deviceCookie(isSecureRequest(request)).serialize({ accounts });
}

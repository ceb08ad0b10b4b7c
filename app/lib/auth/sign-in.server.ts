import { Authenticator } from "remix-auth";
import { FormStrategy } from "remix-auth-form";
import { z } from "zod";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import { recordLoginAttempt, signInLockout } from "~/lib/auth/sign-in-throttle.server";
import { findUserByEmail, normaliseEmail, presentUser, type UserView } from "~/lib/auth/users.server";
import { Membership } from "~/lib/db.server";
import { clientAddress } from "../http/client-address.server";
import { verifyPassword } from "./password.server";
import { isKnownDevice } from "./known-device.server";

/** A sign-in refused for a reason the person can act on; `field` ties it to a form input. */
export class SignInError extends Error {
  constructor(message: string, readonly field: "email" | "password" | null = null) {
    super(message);
    this.name = "SignInError";
  }
}

export const ACCOUNT_DISABLED_MESSAGE = "This account is disabled; ask your site administrator.";

export const signInSchema = z.object({
  email: z.string().trim().min(1, "Enter your e-mail address.").max(254).email("Enter an e-mail address like name@example.org."),
  password: z.string().min(1, "Enter your password.").max(200),
});

// A hash of a random password, compared against when the account does not exist, so a missing
// account takes as long to refuse as a wrong password.
const ABSENT_ACCOUNT_HASH = "$2b$10$E09T61cTmD/llPiNY/gyUOOugM7C12pq2fy3ME.dKRl9eDUgggbEK";

async function auditForAccount(userId: number, action: (typeof AUDIT_ACTIONS)[keyof typeof AUDIT_ACTIONS], ip: string, detail: Record<string, unknown>) {
  // Sign-ins belong to no single project; one event per project the user belongs to lets each
  // project's managers see their members' sign-ins, plus one site-wide event.
  const memberships = await Membership.findAll({ where: { userId }, attributes: ["projectId"] });
  await recordAudit({ action, userId, ip, detail });
  for (const { projectId } of memberships) await recordAudit({ action, userId, projectId, ip, detail });
}

export const authenticator = new Authenticator<UserView>();

authenticator.use(
  new FormStrategy(async ({ form, request }) => {
    const parsed = signInSchema.safeParse({ email: form.get("email"), password: form.get("password") });
    if (!parsed.success) {
      const issue = parsed.error.issues[0];
      throw new SignInError(issue.message, issue.path[0] === "password" ? "password" : "email");
    }
    const email = normaliseEmail(parsed.data.email);
    const ip = clientAddress(request);
    const user = await findUserByEmail(email);
    const knownDevice = user ? await isKnownDevice(request, user.id) : false;
    const lockout = await signInLockout(email, ip, new Date(), knownDevice);
    if (lockout) throw new SignInError(lockout.message);

    const passwordMatches = await verifyPassword(parsed.data.password, user?.passwordHash ?? ABSENT_ACCOUNT_HASH);
    if (!user || !passwordMatches) {
      await recordLoginAttempt(email, ip, false);
      if (user) await auditForAccount(user.id, AUDIT_ACTIONS.signInFailed, ip, { email });
      else await recordAudit({ action: AUDIT_ACTIONS.signInFailed, ip, detail: { email } });
      const after = await signInLockout(email, ip, new Date(), knownDevice);
      throw new SignInError(after ? after.message : "That e-mail and password do not match an account.", after ? null : "password");
    }
    // Said only after the right password, so the message reveals nothing to someone guessing.
    if (user.disabledAt !== null) {
      await auditForAccount(user.id, AUDIT_ACTIONS.signInFailed, ip, { email, reason: "account-disabled" });
      throw new SignInError(ACCOUNT_DISABLED_MESSAGE);
    }
    await recordLoginAttempt(email, ip, true);
    await auditForAccount(user.id, AUDIT_ACTIONS.signIn, ip, {});
    return presentUser(user);
  }),
  "form",
);

export { auditForAccount };

import { afterAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { MAX_FAILURES_PER_ACCOUNT, MAX_FAILURES_PER_ADDRESS, recordLoginAttempt, signInLockout } from "~/lib/auth/sign-in-throttle.server";
import { uniqueEmail } from "./helpers";

afterAll(closeSequelize);

const MINUTE = 60_000;

describe("sign-in rate limit", () => {
  it("locks an account after 5 failures within 15 minutes and says for how long", async () => {
    const email = uniqueEmail("locked");
    const start = new Date("2030-01-01T10:00:00Z");
    for (let i = 0; i < MAX_FAILURES_PER_ACCOUNT - 1; i++) await recordLoginAttempt(email, `10.0.0.${i}`, false, new Date(start.getTime() + i * MINUTE));
    expect(await signInLockout(email, "10.9.9.9", new Date(start.getTime() + 5 * MINUTE))).toBeNull();
    await recordLoginAttempt(email, "10.0.0.9", false, new Date(start.getTime() + 5 * MINUTE));
    const lockout = await signInLockout(email, "10.9.9.9", new Date(start.getTime() + 6 * MINUTE));
    // The first failure (10:00) leaves the 15-minute window at 10:15: at 10:06 that is 9 minutes away.
    expect(lockout).toMatchObject({ scope: "account", retryAfterMinutes: 9 });
    expect(lockout!.message).toBe("Too many failed sign-ins for this account. Try again in 9 minutes.");
    // Once the oldest failure is more than 15 minutes old, four remain in the window: open again.
    expect(await signInLockout(email, "10.9.9.9", new Date(start.getTime() + 15 * MINUTE + 1_000))).toBeNull();
  });

  it("does not count successful sign-ins or other accounts' failures", async () => {
    const email = uniqueEmail("ok");
    const now = new Date("2030-02-01T10:00:00Z");
    for (let i = 0; i < 10; i++) await recordLoginAttempt(email, "10.1.0.1", true, now);
    for (let i = 0; i < 10; i++) await recordLoginAttempt(uniqueEmail("other"), "10.1.0.2", false, now);
    expect(await signInLockout(email, "10.1.0.3", now)).toBeNull();
  });

  it("locks a client address after many failures across different accounts", async () => {
    const address = `10.2.${Math.floor(Math.random() * 200)}.${Math.floor(Math.random() * 200)}`;
    const now = new Date("2030-03-01T10:00:00Z");
    for (let i = 0; i < MAX_FAILURES_PER_ADDRESS; i++) await recordLoginAttempt(uniqueEmail("spray"), address, false, now);
    const lockout = await signInLockout(uniqueEmail("fresh"), address, new Date(now.getTime() + MINUTE));
    expect(lockout).toMatchObject({ scope: "address", retryAfterMinutes: 14 });
  });
});

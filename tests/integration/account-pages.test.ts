import { randomBytes } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { User } from "~/lib/db.server";
import * as adminUsersPage from "~/routes/admin.users";
import { makeUser, requestAs } from "./helpers";

// The site admin's account list, 50 a page, searched by name or e-mail, both in the address.

afterAll(closeSequelize);

const marker = `pager${randomBytes(3).toString("hex")}`;
// The name-only matches' e-mails carry another random text, so they match by name alone.
const other = randomBytes(3).toString("hex");
let adminId: number;

beforeAll(async () => {
  adminId = (await makeUser("pager-admin", { isSiteAdmin: true })).id;
  // 55 accounts whose e-mail carries the marker, and 3 whose name does (58 match).
  await User.bulkCreate(Array.from({ length: 55 }, (_, i) => ({ email: `${marker}-${String(i).padStart(2, "0")}@example.test`, name: `Paged person ${String(i).padStart(2, "0")}`, passwordHash: "x" })));
  await User.bulkCreate(Array.from({ length: 3 }, (_, i) => ({ email: `named-${other}-${i}@elsewhere.test`, name: `Zz ${marker} ${i}`, passwordHash: "x" })));
});

async function list(query: string) {
  const request = await requestAs(adminId, `/admin/users${query}`);
  return (await adminUsersPage.loader({ request, params: {}, context: {} } as never)) as Awaited<ReturnType<typeof adminUsersPage.loader>>;
}

describe("the account list's pages", () => {
  it("shows 50 a page, by name, and the rest on the next (computed: 58 match, 50 + 8)", async () => {
    const first = await list(`?q=${marker}`);
    expect([first.total, first.pages, first.page, first.accounts.length]).toEqual([58, 2, 1, 50]);
    expect(first.accounts[0].name).toBe("Paged person 00");
    const second = await list(`?q=${marker}&page=2`);
    expect(second.accounts.map((account) => account.name)).toEqual([
      "Paged person 50", "Paged person 51", "Paged person 52", "Paged person 53", "Paged person 54", `Zz ${marker} 0`, `Zz ${marker} 1`, `Zz ${marker} 2`,
    ]);
    // invariant: the two pages hold every match once
    expect(new Set([...first.accounts, ...second.accounts].map((account) => account.id)).size).toBe(58);
  });

  it("matches the name as well as the e-mail, and takes a bad or too large page as the nearest one", async () => {
    expect((await list(`?q=Zz%20${marker}`)).accounts.map((account) => account.name)).toEqual([`Zz ${marker} 0`, `Zz ${marker} 1`, `Zz ${marker} 2`]);
    expect((await list(`?q=${marker}&page=99`)).page).toBe(2);
    expect((await list(`?q=${marker}&page=nonsense`)).page).toBe(1);
    expect((await list(`?q=${marker}&page=-3`)).page).toBe(1);
    const none = await list(`?q=no-such-${marker}`);
    expect([none.total, none.pages, none.page, none.accounts.length]).toEqual([0, 1, 1, 0]);
  });
});

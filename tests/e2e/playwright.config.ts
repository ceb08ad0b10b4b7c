import { defineConfig } from "@playwright/test";

// Browser tests in Debian's Chromium (never a downloaded browser). `npm test` starts the app on
// the e2e database with the demo seeded and passes BASE_URL, MAILBOX_DIR and CHROMIUM_PATH.
export default defineConfig({
  testDir: ".",
  testMatch: "**/*.spec.ts",
  fullyParallel: false,
  workers: 2,
  retries: 0,
  reporter: "list",
  timeout: 30_000,
  use: {
    baseURL: process.env.BASE_URL ?? "http://127.0.0.1:3100",
    headless: true,
    trace: "off",
    launchOptions: {
      executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
      args: [
        "--no-sandbox",
        "--disable-gpu",
        "--disable-quic",
        "--no-first-run",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
      ],
    },
  },
});

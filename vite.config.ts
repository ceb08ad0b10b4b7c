/// <reference types="vitest/config" />
import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { defineConfig } from "vite";

const underVitest = Boolean(process.env.VITEST);

export default defineConfig({
  // The React Router plugin builds the app; Vitest runs plain modules and does not need it.
  plugins: [tailwindcss(), !underVitest && reactRouter()],
  resolve: { tsconfigPaths: true },
  server: { host: "127.0.0.1" },
  test: {
    // Unit tests sit beside the code; integration tests against the real MariaDB sit in
    // tests/integration. Browser tests run under Playwright (tests/e2e), not here.
    include: [
      "shared/**/*.test.ts",
      "app/**/*.test.ts",
      "db/**/*.test.ts",
      "sample-data/**/*.test.ts",
      "tests/integration/**/*.test.ts",
    ],
    environment: "node",
    testTimeout: 30_000,
    hookTimeout: 60_000,
    fileParallelism: false,
  },
});

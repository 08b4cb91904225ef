import { defineConfig } from "@playwright/test";
import { env } from "./lib/env";

const { PAPIN_E2E_PORT: port, PAPIN_CHROMIUM, CI } = env();
export const baseURL = `http://127.0.0.1:${port}`;

// The browser tests run the production build on a fresh demo database of their own.
export default defineConfig({
  testDir: "tests/e2e",
  timeout: 60_000,
  expect: { timeout: 10_000 },
  fullyParallel: false,
  workers: 1,
  retries: CI ? 1 : 0,
  reporter: [["list"]],
  outputDir: "test-results",
  use: {
    baseURL,
    browserName: "chromium",
    headless: true,
    screenshot: "only-on-failure",
    launchOptions: {
      executablePath: PAPIN_CHROMIUM,
      args: ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
    },
  },
  webServer: {
    command: `bash tests/support/start-e2e-server.sh ${port}`,
    url: `${baseURL}/api/health`,
    timeout: 180_000,
    reuseExistingServer: false,
    stdout: "pipe",
    stderr: "pipe",
  },
});

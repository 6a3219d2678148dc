import { execSync } from "node:child_process";
import os from "node:os";
import path from "node:path";
import { defineConfig } from "@playwright/test";

const chromium = process.env.CHROMIUM_PATH ?? execSync("command -v chromium || command -v chromium-browser").toString().trim();
const port = Number(process.env.E2E_PORT ?? 3100);
// A fresh database per run, outside the repository, so end-to-end tests never touch a user's data.
const dbFile = path.join(os.tmpdir(), `cpet-desk-e2e-${process.pid}.sqlite`);

export default defineConfig({
  testDir: "e2e",
  workers: 1,
  retries: 0,
  timeout: 60_000,
  reporter: [["list"], ["json", { outputFile: "reports/e2e.json" }]],
  use: {
    baseURL: `http://127.0.0.1:${port}`,
    browserName: "chromium",
    screenshot: "off",
    launchOptions: {
      executablePath: chromium,
      args: [
        "--headless",
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
  webServer: {
    command: `node node_modules/next/dist/bin/next start -p ${port} -H 127.0.0.1`,
    url: `http://127.0.0.1:${port}/api/health`,
    reuseExistingServer: false,
    timeout: 90_000,
    env: { CPET_DB: dbFile, NEXT_TELEMETRY_DISABLED: "1" },
  },
});

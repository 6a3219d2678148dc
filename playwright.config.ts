import { execSync } from "node:child_process";
import os from "node:os";
import path from "node:path";
import { defineConfig } from "@playwright/test";
import { E2E_ACCOUNTS, accountsPort } from "./e2e/fixtures/accounts";

const chromium = process.env.CHROMIUM_PATH ?? execSync("command -v chromium || command -v chromium-browser").toString().trim();
const port = Number(process.env.E2E_PORT ?? 3100);
// A fresh database per run, outside the repository, so end-to-end tests never touch a user's data.
const dbFile = path.join(os.tmpdir(), `cpet-desk-e2e-${process.pid}.sqlite`);
// A second server on its own database where log-in is required (e2e/accounts.spec.ts): two INVENTED accounts are made
// with the CLI before it starts, exactly as a site would make them.
const ACCOUNTS_PORT = accountsPort();
const accountsDb = path.join(os.tmpdir(), `cpet-desk-e2e-accounts-${process.pid}.sqlite`);
const addAccount = (role: keyof typeof E2E_ACCOUNTS) => {
  const a = E2E_ACCOUNTS[role];
  return `printf '%s\\n' '${a.password}' | node bin/cpet.mjs account add ${a.username} --name '${a.name}' --role ${role}`;
};
const nextStart = (p: number) => `node node_modules/next/dist/bin/next start -p ${p} -H 127.0.0.1`;

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
  webServer: [
    {
      command: nextStart(port),
      url: `http://127.0.0.1:${port}/api/health`,
      reuseExistingServer: false,
      timeout: 90_000,
      env: { CPET_DB: dbFile, NEXT_TELEMETRY_DISABLED: "1" },
    },
    {
      command: `rm -f '${accountsDb}'* && ${addAccount("clinician")} && ${addAccount("physiologist")} && ${nextStart(ACCOUNTS_PORT)}`,
      url: `http://127.0.0.1:${ACCOUNTS_PORT}/api/health`,
      reuseExistingServer: false,
      timeout: 90_000,
      env: { CPET_DB: accountsDb, NEXT_TELEMETRY_DISABLED: "1" },
    },
  ],
});

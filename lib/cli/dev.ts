/**
 * `npm run dev`: prepares the database (migrations, demo site), starts the local fake of Resend's
 * HTTP API so notification mail can be read on the Mail page (/admin/mail), then runs `next dev`.
 * With RESEND_API_KEY set (a real provider), no fake is started.
 */
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import path from "node:path";
import { env, environmentForChildProcess } from "../env";

const root = path.resolve(import.meta.dirname, "../..");
const tsx = path.join(root, "node_modules/tsx/dist/cli.mjs");
const next = path.join(root, "node_modules/next/dist/bin/next");
const children: ChildProcess[] = [];

const prepared = spawnSync(process.execPath, [tsx, "--tsconfig", "db/tsconfig.scripts.json", "db/prepare.ts"], { cwd: root, stdio: "inherit" });
if (prepared.status !== 0) process.exit(prepared.status ?? 1);

// Validated by db/prepare.ts above, which names a wrong variable in one line.
const config = env();
const port = String(config.PORT);
const fakePort = String(config.FAKE_RESEND_PORT);
const childEnv = environmentForChildProcess();
if (!config.RESEND_API_KEY && !config.RESEND_BASE_URL) {
  childEnv.RESEND_BASE_URL = `http://127.0.0.1:${fakePort}`;
  childEnv.FAKE_RESEND_MAILBOX ??= path.join(root, "data", "fake-mailbox.jsonl");
  children.push(spawn(process.execPath, [tsx, "lib/mail/fake-resend-server.ts", "--port", fakePort], { cwd: root, env: childEnv, stdio: "inherit" }));
  console.log(`Local mail fake on ${childEnv.RESEND_BASE_URL}; read what Papin sends on the Mail page (menu: Mail, /admin/mail), signed in as the administrator.`);
}
children.push(spawn(process.execPath, [next, "dev", "-H", "127.0.0.1", "-p", port], { cwd: root, env: childEnv, stdio: "inherit" }));

const stop = () => {
  for (const child of children) child.kill("SIGTERM");
};
process.on("SIGINT", stop);
process.on("SIGTERM", stop);
children.at(-1)!.on("exit", (code) => {
  stop();
  process.exit(code ?? 0);
});

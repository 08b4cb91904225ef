/**
 * `npm run ledger:anchor [-- --mail] [-- --verify]`: appends the audit ledger's head (time, event count,
 * last seq, hash) to the outside anchor file; `--mail` also queues the daily ledger-head mail to each
 * site's auditors (and tries to send it now); `--verify` first checks the chain against the anchors
 * already written and exits 1, saying why, when they disagree. Meant for cron, e.g. once a day:
 *   15 6 * * *  cd /srv/papin && npm run --silent ledger:anchor -- --verify --mail
 */
import { env } from "../env";
import { plural, agree } from "@/lib/domain";

async function main() {
  const args = new Set(process.argv.slice(2));
  const unknown = [...args].filter((a) => a !== "--mail" && a !== "--verify");
  if (unknown.length) throw new Error(`Unknown option ${unknown[0]}; use --mail and/or --verify.`);
  env(); // a wrong variable is named in one line before anything runs
  const { verifyLedger } = await import("@/lib/services/audit");
  const { anchorLedgerHead, mailLedgerHead } = await import("@/lib/services/ledger-anchors");
  if (args.has("--verify")) {
    const result = await verifyLedger();
    if (!result.ok) {
      console.error(`The audit ledger does not verify: ${result.problem}`);
      process.exitCode = 1;
      return;
    }
    console.log(
      `Ledger verified: ${plural(result.events, "event")}${result.anchors.status === "match" ? `, ${plural(result.anchors.anchors, "anchor")} ${agree(result.anchors.anchors, "matches", "match")}` : `; ${result.anchors.problem}`}.`,
    );
  }
  const { anchor, file, mailIds } = args.has("--mail") ? await mailLedgerHead() : { ...(await anchorLedgerHead()), mailIds: null };
  console.log(`Ledger head at ${anchor.at}: ${plural(anchor.events, "event")}, last event ${anchor.seq}, hash ${anchor.hash}; appended to ${file}.`);
  if (mailIds) {
    const { deliverPendingMail, mailTransport } = await import("@/lib/mail/delivery");
    const configured = mailTransport().configured;
    const sent = configured && mailIds.length ? await deliverPendingMail({ ids: mailIds }) : null;
    const outcome = !configured ? " (mail is not configured: they wait in the outbox)" : sent ? ` (${sent.sent} sent now; any other waits in the outbox)` : "";
    console.log(`Queued ${plural(mailIds.length, "ledger-head mail")} to auditors${outcome}.`);
  }
}

main().catch((error: unknown) => {
  console.error(`The ledger anchor could not be written: ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
});

import "server-only";
import { appendFileSync, mkdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { filePathOf } from "@/db";
import { getLedgerHead, listSiteAuditors, withLedgerHead } from "@/db/queries/audit";
import { env } from "@/lib/env";
import { anchorLine, anchorOf, parseAnchorLines, type LedgerAnchor } from "@/lib/integrity/anchors";
import { auditLedgerUrl, ledgerHeadMail } from "@/lib/mail/templates";
import { enqueueMail } from "./mail";

/**
 * The outside anchor file: PAPIN_LEDGER_ANCHOR_FILE, else ledger-anchors.jsonl beside the embedded
 * database file, else (a libSQL server) data/ledger-anchors.jsonl under the working directory.
 */
export function ledgerAnchorFile(): string {
  const { PAPIN_LEDGER_ANCHOR_FILE, DATABASE_URL } = env();
  if (PAPIN_LEDGER_ANCHOR_FILE) return path.resolve(PAPIN_LEDGER_ANCHOR_FILE);
  const databaseFile = filePathOf(DATABASE_URL);
  return databaseFile ? path.join(path.dirname(databaseFile), "ledger-anchors.jsonl") : path.resolve("data", "ledger-anchors.jsonl");
}

/** Every anchor written so far, in file order; no file is no anchor; an unreadable or damaged file is a problem. */
export function readLedgerAnchors(): { file: string; anchors: LedgerAnchor[]; problem: string | null } {
  const file = ledgerAnchorFile();
  let text: string;
  try {
    text = readFileSync(file, "utf8");
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    if (code === "ENOENT") return { file, anchors: [], problem: null };
    return { file, anchors: [], problem: `The ledger's anchor file cannot be read (${code ?? "unknown error"}), so the chain cannot be compared with it.` };
  }
  return { file, ...parseAnchorLines(text) };
}

/** One line appended (O_APPEND: whole lines, even with several writers). Never rewrites earlier lines. */
function appendAnchor(anchor: LedgerAnchor): string {
  const file = ledgerAnchorFile();
  mkdirSync(path.dirname(file), { recursive: true });
  appendFileSync(file, anchorLine(anchor), { mode: 0o640 });
  return file;
}

/** Writes the ledger head now to the anchor file (`npm run ledger:anchor`, after an archived report). */
export async function anchorLedgerHead({ now = new Date() }: { now?: Date } = {}): Promise<{ anchor: LedgerAnchor; file: string }> {
  const anchor = anchorOf(await getLedgerHead(), now);
  return { anchor, file: appendAnchor(anchor) };
}

/**
 * After a signed report is archived: the signature is already committed, so a full disk or a
 * missing permission must not turn it into an error; it is logged, and the next anchor catches up.
 */
export async function anchorLedgerHeadAfterArchive(): Promise<void> {
  try {
    await anchorLedgerHead();
  } catch (error) {
    console.error(`[papin] the ledger head could not be written to ${ledgerAnchorFile()}: ${error instanceof Error ? error.message : String(error)}`);
  }
}

/**
 * The daily ledger-head mail: one mail per site to its enabled auditors, queued in one transaction
 * with the head it reports, and the same head appended to the anchor file. Sites without an
 * auditor get none.
 */
export async function mailLedgerHead({ now = new Date() }: { now?: Date } = {}) {
  const bySite = new Map<string, { siteName: string; to: string[] }>();
  for (const a of await listSiteAuditors()) {
    const site = bySite.get(a.siteId) ?? { siteName: a.siteName, to: [] };
    site.to.push(a.email);
    bySite.set(a.siteId, site);
  }
  const at = now.toISOString();
  const { head, mailIds } = await withLedgerHead(async (tx, head) => {
    const ids: string[] = [];
    for (const [siteId, { siteName, to }] of bySite) {
      const content = ledgerHeadMail({ siteName, at: at.slice(0, 19).replace("T", " "), events: head.events, lastSeq: head.lastSeq, lastHash: head.lastHash, url: auditLedgerUrl() });
      const queued = await enqueueMail(tx, { to, ...content, siteId });
      if (queued) ids.push(queued.id);
    }
    return { head, mailIds: ids };
  });
  const anchor = anchorOf(head, now);
  return { anchor, file: appendAnchor(anchor), mailIds };
}

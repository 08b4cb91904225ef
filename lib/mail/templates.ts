/**
 * Papin's notification e-mails: a subject, an HTML body and a plain-text body, each with a link
 * to the record and the short safety reminder. Pure: values in, strings out.
 */
import { publicBaseUrl } from "@/lib/env";
import { SAFETY_SHORT } from "@/lib/safety";
import { cycleStatusLabel, plural, type CycleStatus } from "@/lib/domain";

export type MailContent = { subject: string; html: string; text: string };

type CycleFacts = {
  cycleNumber: string | number;
  sterilizerName: string;
  /** Absolute link to the cycle's page. */
  url: string;
};

const HTML_ESCAPES: Record<string, string> = { "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" };

export function escapeHtml(value: string | number): string {
  return String(value).replace(/[&<>"']/g, (c) => HTML_ESCAPES[c]);
}

/** Subjects are one line: a name with a line break must not start a new header. */
function oneLine(value: string | number): string {
  return String(value).replace(/\s+/g, " ").trim();
}

/** The link to a cycle's page: always on the configured public URL, never a request's host. */
export function cycleUrl(cycleId: string): string {
  return `${publicBaseUrl()}/cycles/${encodeURIComponent(cycleId)}`;
}

type Block = { kind: "p"; text: string } | { kind: "quote"; label: string; text: string } | { kind: "list"; label: string; items: string[] };

function layout({ heading, blocks, url, action }: { heading: string; blocks: Block[]; url: string; action: string }): { html: string; text: string } {
  const htmlBlocks = blocks
    .map((b) => {
      if (b.kind === "p") return `<p style="margin:0 0 12px">${escapeHtml(b.text)}</p>`;
      if (b.kind === "quote") {
        return `<p style="margin:0 0 4px;font-weight:600">${escapeHtml(b.label)}</p><blockquote style="margin:0 0 12px;padding:8px 12px;border-left:3px solid #b08d57;background:#f7f4ee;white-space:pre-wrap">${escapeHtml(b.text)}</blockquote>`;
      }
      return `<p style="margin:0 0 4px;font-weight:600">${escapeHtml(b.label)}</p><ul style="margin:0 0 12px;padding-left:20px">${b.items.map((i) => `<li>${escapeHtml(i)}</li>`).join("")}</ul>`;
    })
    .join("\n");
  const html = `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>${escapeHtml(heading)}</title></head>
<body style="margin:0;padding:24px;background:#faf8f4;color:#1f2328;font-family:Inter,Segoe UI,Helvetica,Arial,sans-serif;font-size:15px;line-height:1.5">
<div style="max-width:560px;margin:0 auto;background:#ffffff;border:1px solid #e2ddd3;border-radius:8px;padding:24px">
<p style="margin:0 0 16px;font-size:13px;letter-spacing:.04em;text-transform:uppercase;color:#8a6d3b">Papin</p>
<h1 style="margin:0 0 16px;font-size:19px">${escapeHtml(heading)}</h1>
${htmlBlocks}
<p style="margin:20px 0"><a href="${escapeHtml(url)}" style="display:inline-block;padding:9px 16px;border-radius:6px;background:#1f3a4d;color:#ffffff;text-decoration:none;font-weight:600">${escapeHtml(action)}</a></p>
<p style="margin:0 0 16px;font-size:13px;color:#5b6168">Or open this address: <a href="${escapeHtml(url)}" style="color:#1f3a4d">${escapeHtml(url)}</a></p>
<p style="margin:16px 0 0;padding-top:12px;border-top:1px solid #e2ddd3;font-size:12px;color:#5b6168">${escapeHtml(SAFETY_SHORT)}</p>
</div>
<p style="max-width:560px;margin:12px auto 0;font-size:12px;color:#8b9096">You receive this because of your role in Papin. It was sent automatically; replies are not read.</p>
</body></html>`;
  const textBlocks = blocks.map((b) => {
    if (b.kind === "p") return b.text;
    if (b.kind === "quote")
      return `${b.label}\n${b.text
        .split("\n")
        .map((l) => `> ${l}`)
        .join("\n")}`;
    return `${b.label}\n${b.items.map((i) => `- ${i}`).join("\n")}`;
  });
  const text = [
    heading,
    "",
    ...textBlocks.flatMap((t) => [t, ""]),
    `${action}: ${url}`,
    "",
    "--",
    SAFETY_SHORT,
    "",
    "You receive this because of your role in Papin. It was sent automatically; replies are not read.",
    "",
  ].join("\n");
  return { html, text };
}

// The state names of the list, the CSV and the PDF (lib/domain), in the middle of a sentence.
const stateWord = (status: CycleStatus) => cycleStatusLabel(status).toLowerCase();

/** To the site's engineers: a cycle waits for their review. */
export function cycleSubmittedMail({ cycleNumber, sterilizerName, submitterName, url }: CycleFacts & { submitterName: string }): MailContent {
  const heading = `Cycle ${oneLine(cycleNumber)} on ${oneLine(sterilizerName)} is ready for review`;
  return {
    subject: heading,
    ...layout({
      heading,
      url,
      action: "Review the cycle",
      blocks: [
        { kind: "p", text: `${submitterName} submitted cycle ${cycleNumber} on ${sterilizerName} for review.` },
        { kind: "p", text: "Check the figures and the flags, then approve or return it with a reason. You will be asked for your password when you sign." },
      ],
    }),
  };
}

/** To the person who submitted: the cycle came back, with the engineer's reason. */
export function cycleRejectedMail({ cycleNumber, sterilizerName, url, reason, signerName }: CycleFacts & { reason: string; signerName: string }): MailContent {
  const heading = `Cycle ${oneLine(cycleNumber)} on ${oneLine(sterilizerName)} was ${stateWord("returned")}`;
  return {
    subject: heading,
    ...layout({
      heading,
      url,
      action: "Open the cycle",
      blocks: [
        { kind: "p", text: `${signerName} returned cycle ${cycleNumber} on ${sterilizerName} without approving it.` },
        { kind: "quote", label: "Reason given", text: reason },
        { kind: "p", text: "Correct the file or the channel mapping, or add what is missing, then submit the cycle again. The earlier analysis stays on record." },
      ],
    }),
  };
}

/** To the person who submitted: the cycle was approved and its report archived. */
export function cycleApprovedMail({ cycleNumber, sterilizerName, url, signerName, reportNumber }: CycleFacts & { signerName: string; reportNumber: string }): MailContent {
  const heading = `Cycle ${oneLine(cycleNumber)} on ${oneLine(sterilizerName)} was ${stateWord("approved")}`;
  return {
    subject: heading,
    ...layout({
      heading,
      url,
      action: "Open the cycle and its report",
      blocks: [
        { kind: "p", text: `${signerName} approved cycle ${cycleNumber} on ${sterilizerName} with an electronic signature.` },
        { kind: "p", text: `The signed report ${reportNumber} is in the archive. The record is now locked; any correction becomes a new, linked record.` },
      ],
    }),
  };
}

/** To the person who submitted: the failed test was confirmed as a failure and its report archived marked FAIL. */
export function cycleFailureConfirmedMail({
  cycleNumber,
  sterilizerName,
  url,
  signerName,
  reportNumber,
  reason,
}: CycleFacts & { signerName: string; reportNumber: string; reason: string | null }): MailContent {
  const heading = `Cycle ${oneLine(cycleNumber)} on ${oneLine(sterilizerName)}: ${stateWord("failure-confirmed")}`;
  const blocks: Block[] = [{ kind: "p", text: `${signerName} confirmed with an electronic signature that cycle ${cycleNumber} on ${sterilizerName} failed its test.` }];
  if (reason) blocks.push({ kind: "quote", label: "Note from the engineer", text: reason });
  blocks.push({ kind: "p", text: `The signed report ${reportNumber}, marked FAIL, is in the archive and the record is locked. Find and correct the cause before the sterilizer is tested again.` });
  return { subject: heading, ...layout({ heading, url, action: "Open the cycle and its report", blocks }) };
}

/** To the site's engineers at once: an analysis did not pass. */
export function analysisFailedMail({
  cycleNumber,
  sterilizerName,
  url,
  summary,
  failedChecks,
  submitterName,
}: CycleFacts & { summary: string; failedChecks: string[]; submitterName?: string }): MailContent {
  const heading = `Cycle ${oneLine(cycleNumber)} on ${oneLine(sterilizerName)} did not pass its analysis`;
  const blocks: Block[] = [
    { kind: "p", text: `The analysis of cycle ${cycleNumber} on ${sterilizerName}${submitterName ? `, uploaded by ${submitterName},` : ""} did not pass.` },
    { kind: "p", text: summary },
  ];
  if (failedChecks.length) blocks.push({ kind: "list", label: "Checks not met", items: failedChecks });
  blocks.push({ kind: "p", text: "Consider whether the sterilizer should stay out of use until the cause is found, as your site's procedures require." });
  return { subject: heading, ...layout({ heading, url, action: "See the analysis", blocks }) };
}

/** To the site's engineers: a sterilizer went out of use or came back into use. */
export function sterilizerStatusMail({
  sterilizerName,
  status,
  reason,
  since,
  byName,
  url,
}: {
  sterilizerName: string;
  status: "in-use" | "out-of-use";
  reason: string;
  /** when the new state began, in words (the site's local time) */
  since: string;
  /** the engineer who decided, when it was a signed decision */
  byName: string | null;
  url: string;
}): MailContent {
  const out = status === "out-of-use";
  const heading = `${oneLine(sterilizerName)} is ${out ? "out of use" : "back in use"}`;
  const blocks: Block[] = [
    { kind: "p", text: `${sterilizerName} is ${out ? "out of use" : "in use"} since ${since}${byName ? `, by the signed decision of ${byName}` : ""}.` },
    { kind: "quote", label: "Reason", text: reason },
    {
      kind: "p",
      text: out
        ? "Do not process loads in it until it is back in use. A test cycle may still be recorded to re-qualify it; an engineer can also release it with a signed reason."
        : "Loads may be processed again, within your site's procedures.",
    },
  ];
  return { subject: heading, ...layout({ heading, url, action: "Open the sterilizer", blocks }) };
}

/** The link to a sterilizer's page, on the configured public URL. */
export function sterilizerUrl(sterilizerId: string): string {
  return `${publicBaseUrl()}/sterilizers/${encodeURIComponent(sterilizerId)}`;
}

/** The link to the audit ledger page, on the configured public URL. */
export function auditLedgerUrl(): string {
  return `${publicBaseUrl()}/audit`;
}

/**
 * To each site's auditors once a day: the ledger head (event count, last event and its hash), a
 * copy outside the database that a later check of the ledger can be compared with.
 */
export function ledgerHeadMail({ siteName, at, events, lastSeq, lastHash, url }: { siteName: string; at: string; events: number; lastSeq: number; lastHash: string; url: string }): MailContent {
  const heading = `Daily audit-ledger head for ${oneLine(siteName)}: ${plural(events, "event")}`;
  return {
    subject: heading,
    ...layout({
      heading,
      url,
      action: "Open the audit ledger",
      blocks: [
        { kind: "p", text: `At ${at} (UTC) Papin's audit ledger held ${plural(events, "event")}. The newest is event ${lastSeq}; the chain's hash up to it is:` },
        { kind: "quote", label: "Ledger head", text: `events ${events} · last event ${lastSeq}\nSHA-256 ${lastHash}` },
        {
          kind: "p",
          text: "Keep this mail where the portal's database cannot change it. The ledger spans every site, so the count includes other sites' events. If the ledger ever shows fewer events, or another hash at this event, it was altered after this mail was sent.",
        },
      ],
    }),
  };
}

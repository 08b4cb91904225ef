import Link from "next/link";
import { requirePageActor } from "@/lib/auth/page-guard";
import { getMailOutbox } from "@/lib/services/mail";
import type { OutboxStatus } from "@/lib/services/mail";
import { MAX_MAIL_ATTEMPTS } from "@/lib/mail/delivery";
import type { FakeMailbox } from "@/lib/mail/fake-mailbox";
import { EmptyState, PageHeader, Panel } from "@/components/ui/panel";
import { Badge, type BadgeTone } from "@/components/ui/badge";
import { formatDateTime } from "@/lib/format";
import { RetryMailButton, SendDueMailButton } from "./mail-actions";
import { TableFrame } from "@/components/ui/table-frame";

export const metadata = { title: "Mail" };
export const dynamic = "force-dynamic";

const STATUS: Record<OutboxStatus, { label: string; tone: BadgeTone }> = {
  pending: { label: "Pending", tone: "steam" },
  sent: { label: "Sent", tone: "pass" },
  failed: { label: "Failed", tone: "fail" },
};
const FILTERS: Array<{ value?: OutboxStatus; label: string }> = [{ label: "All" }, { value: "pending", label: "Pending" }, { value: "failed", label: "Failed" }, { value: "sent", label: "Sent" }];

export default async function MailPage({ searchParams }: { searchParams: Promise<{ status?: string }> }) {
  const actor = await requirePageActor("mail:read-outbox");
  const { status: rawStatus } = await searchParams;
  const status = rawStatus && rawStatus in STATUS ? (rawStatus as OutboxStatus) : undefined;
  const { counts, rows, mailbox, transport } = await getMailOutbox({ actor, status });
  const total = counts.pending + counts.sent + counts.failed;

  return (
    <>
      <PageHeader
        title="Mail"
        subtitle={`Notifications wait in the outbox until the mail service accepts them. A failed try is repeated after 1, 2, 4, 8 … minutes, up to ${MAX_MAIL_ATTEMPTS} tries; a sign-off never waits for mail.`}
        actions={<SendDueMailButton disabled={!transport.configured || counts.pending === 0} />}
      />
      <TransportNotice configured={transport.configured} baseUrl={transport.baseUrl} mailbox={mailbox} />

      <Panel
        title="Outbox"
        className="mb-gutter"
        action={
          <nav aria-label="Filter the outbox" className="flex flex-wrap gap-1 text-sm">
            {FILTERS.map((f) => {
              const active = f.value === status;
              const n = f.value ? counts[f.value] : total;
              return (
                <Link
                  key={f.label}
                  href={f.value ? `/admin/mail?status=${f.value}` : "/admin/mail"}
                  aria-current={active ? "page" : undefined}
                  className={`rounded-md px-2 py-1 ${active ? "bg-paper-sunk font-medium text-ink" : "text-ink-muted hover:bg-paper-sunk"}`}
                >
                  {f.label} <span className="text-xs text-ink-faint">{n}</span>
                </Link>
              );
            })}
          </nav>
        }
      >
        {rows.length === 0 ? (
          <EmptyState title={status ? `No ${STATUS[status].label.toLowerCase()} e-mail.` : "The outbox is empty."}>
            E-mail is queued when a cycle is submitted, returned or approved, and when an analysis does not pass.
          </EmptyState>
        ) : (
          <TableFrame label="Outbox">
            <table className="data-table" data-testid="outbox-table">
              <thead>
                <tr>
                  <th>Status</th>
                  <th>To</th>
                  <th>Subject</th>
                  <th className="text-right">Tries</th>
                  <th>Last error</th>
                  <th>Queued (UTC)</th>
                  <th>Sent / next try (UTC)</th>
                  <th>
                    <span className="sr-only">Actions</span>
                  </th>
                </tr>
              </thead>
              <tbody>
                {rows.map((m) => (
                  <tr key={m.id} data-status={m.status}>
                    <td>
                      <Badge tone={STATUS[m.status].tone}>{STATUS[m.status].label}</Badge>
                    </td>
                    <td className="mono max-w-[14rem] break-words">{m.to.join(", ")}</td>
                    <td className="max-w-[20rem]">
                      {m.relatedCycleId ? (
                        <Link className="underline decoration-ink-line underline-offset-2 hover:decoration-ink" href={`/cycles/${m.relatedCycleId}`}>
                          {m.subject}
                        </Link>
                      ) : (
                        m.subject
                      )}
                    </td>
                    <td className="text-right tabular-nums">{m.attempts}</td>
                    <td className={`max-w-[18rem] break-words text-xs ${m.status === "sent" ? "text-ink-faint" : "text-fail-700"}`}>
                      {m.lastError ? (m.status === "sent" ? `Before it went through: ${m.lastError}` : m.lastError) : "—"}
                    </td>
                    <td className="whitespace-nowrap text-xs text-ink-muted">{formatDateTime(m.createdAt)}</td>
                    <td className="whitespace-nowrap text-xs text-ink-muted">
                      {m.status === "sent" ? formatDateTime(m.sentAt) : m.status === "pending" ? (m.nextAttemptAt ? `next ${formatDateTime(m.nextAttemptAt)}` : "due now") : "—"}
                    </td>
                    <td>
                      <RetryMailButton id={m.id} subject={m.subject} canRetry={m.status !== "sent"} />
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
            {rows.length === 100 && <p className="mt-2 text-xs text-ink-muted">Showing the newest 100.</p>}
          </TableFrame>
        )}
      </Panel>

      {mailbox.state !== "not-configured" && mailbox.state !== "not-fake" && <FakeMailboxPanel mailbox={mailbox} />}
    </>
  );
}

function TransportNotice({ configured, baseUrl, mailbox }: { configured: boolean; baseUrl?: string; mailbox: FakeMailbox }) {
  if (!configured) {
    return (
      <p role="status" className="mb-gutter rounded-md border border-caution-500/30 bg-caution-50 px-4 py-3 text-sm text-caution-700">
        Mail is not configured: e-mail stays pending in the outbox. Set <span className="mono">RESEND_API_KEY</span> to send through Resend, or <span className="mono">RESEND_BASE_URL</span> to the
        local fake mail service in development.
      </p>
    );
  }
  if (mailbox.state === "ok" || mailbox.state === "unreachable") {
    return (
      <p className="mb-gutter rounded-md border border-steam-500/30 bg-steam-50 px-4 py-3 text-sm text-steam-700">
        Sending to the local fake mail service at <span className="mono">{mailbox.baseUrl}</span>: nothing leaves this machine. What it received is listed below.
      </p>
    );
  }
  return <p className="mb-gutter rounded-md border border-ink-line bg-paper-sunk px-4 py-3 text-sm text-ink-soft">Sending through {baseUrl ? <span className="mono">{baseUrl}</span> : "Resend"}.</p>;
}

function FakeMailboxPanel({ mailbox }: { mailbox: Extract<FakeMailbox, { state: "ok" | "unreachable" }> }) {
  return (
    <Panel title="Development mailbox" action={<span className="mono text-ink-muted">{mailbox.baseUrl}</span>}>
      {mailbox.state === "unreachable" ? (
        <EmptyState title="The local fake mail service does not answer.">
          {mailbox.problem} Start it with <span className="mono">npx tsx lib/mail/fake-resend-server.ts --port 3025</span>; e-mail waits in the outbox meanwhile.
        </EmptyState>
      ) : mailbox.messages.length === 0 ? (
        <EmptyState title="No e-mail received yet." />
      ) : (
        <ul className="divide-y divide-ink-line" data-testid="fake-mailbox">
          {mailbox.messages.map((m) => (
            <li key={m.id} className="py-2">
              <details>
                <summary className="flex cursor-pointer flex-wrap items-baseline gap-x-3 gap-y-1 rounded px-1 py-1 hover:bg-paper-sunk">
                  <span className="whitespace-nowrap text-xs text-ink-muted">{formatDateTime(m.created_at)}</span>
                  <span className="font-medium">{m.subject}</span>
                  <span className="mono text-ink-muted">→ {m.to.join(", ")}</span>
                </summary>
                <div className="mt-2 space-y-3 px-1">
                  <dl className="grid grid-cols-[auto_minmax(0,1fr)] gap-x-3 text-xs">
                    <dt className="text-ink-muted">From</dt>
                    <dd className="mono">{m.from}</dd>
                    <dt className="text-ink-muted">To</dt>
                    <dd className="mono">{m.to.join(", ")}</dd>
                    <dt className="text-ink-muted">Message id</dt>
                    <dd className="mono">{m.id}</dd>
                  </dl>
                  {m.html && (
                    // An empty sandbox: no scripts, no forms, no access to the portal's origin.
                    <iframe
                      sandbox=""
                      loading="lazy"
                      referrerPolicy="no-referrer"
                      srcDoc={m.html}
                      title={`HTML body of “${m.subject}”`}
                      className="h-96 w-full rounded-md border border-ink-line bg-white"
                    />
                  )}
                  {m.text && (
                    <details>
                      <summary className="cursor-pointer text-xs text-ink-muted">Plain-text body</summary>
                      <pre className="mono mt-1 max-h-96 overflow-auto whitespace-pre-wrap rounded-md bg-paper-sunk p-3">{m.text}</pre>
                    </details>
                  )}
                </div>
              </details>
            </li>
          ))}
        </ul>
      )}
      {mailbox.state === "ok" && mailbox.hasMore && <p className="mt-2 text-xs text-ink-muted">Showing the newest 50.</p>}
    </Panel>
  );
}

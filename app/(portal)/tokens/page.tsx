import { requirePageActor } from "@/lib/auth/page-guard";
import { API_TOKEN_ROUTES, API_TOKEN_SCOPE_LABELS, plural } from "@/lib/domain";
import { formatDateTime } from "@/lib/format";
import { listApiTokens } from "@/lib/services/api-tokens";
import { EmptyState, PageHeader, Panel } from "@/components/ui/panel";
import { Badge } from "@/components/ui/badge";
import { IssueTokenForm, RevokeTokenForm } from "@/components/tokens/token-forms";
import { TableFrame } from "@/components/ui/table-frame";

export const metadata = { title: "API tokens" };

const STATE_BADGES = {
  active: <Badge tone="pass">Active</Badge>,
  expired: <Badge tone="caution">Expired</Badge>,
  revoked: <Badge tone="fail">Revoked</Badge>,
};

export default async function TokensPage() {
  const actor = await requirePageActor("api-token:manage");
  const { tokens, sterilizers, timeZone } = await listApiTokens({ actor });
  return (
    <>
      <PageHeader
        title="API tokens"
        subtitle={`Tokens let a logger gateway upload cycles without a person signing in. A token is accepted only on ${API_TOKEN_ROUTES.join(", ")}; each use is written to the audit ledger.`}
      />
      <div className="grid gap-gutter xl:grid-cols-[minmax(0,1fr)_22rem]">
        <Panel title={plural(tokens.length, "token")}>
          {tokens.length === 0 ? (
            <EmptyState title="No API token has been issued for this site.">Issue one with the form beside this list.</EmptyState>
          ) : (
            <TableFrame label="API tokens">
              <table className="data-table" data-testid="tokens-table">
                <thead>
                  <tr>
                    <th>Name</th>
                    <th>Scope</th>
                    <th>Expires</th>
                    <th>Last use</th>
                    <th>Issued by</th>
                    <th>State</th>
                    <th>
                      <span className="sr-only">Actions</span>
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {tokens.map((t) => (
                    <tr key={t.id}>
                      <td>
                        <p className="font-medium">{t.name}</p>
                        <p className="mono text-ink-muted">{t.prefix}…</p>
                      </td>
                      <td>
                        <p>{API_TOKEN_SCOPE_LABELS[t.scope]}</p>
                        <p className="text-xs text-ink-muted">{t.sterilizerNames ? t.sterilizerNames.join(", ") : "All sterilizers of the site"}</p>
                      </td>
                      <td className="text-xs">{formatDateTime(t.expiresAt, timeZone)}</td>
                      <td className="text-xs text-ink-muted">{t.lastUsedAt ? formatDateTime(t.lastUsedAt, timeZone) : "Never"}</td>
                      <td className="text-xs">
                        {t.issuedBy}
                        <p className="text-ink-muted">{formatDateTime(t.createdAt, timeZone)}</p>
                      </td>
                      <td>
                        {STATE_BADGES[t.state]}
                        {t.revokedAt && (
                          <p className="text-xs text-ink-muted">
                            {formatDateTime(t.revokedAt, timeZone)}, {t.revokedBy}
                          </p>
                        )}
                      </td>
                      <td>{t.state !== "revoked" && <RevokeTokenForm id={t.id} name={t.name} />}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </TableFrame>
          )}
        </Panel>
        <Panel title="Issue a token">
          <IssueTokenForm sterilizers={sterilizers} />
        </Panel>
      </div>
    </>
  );
}

import { requirePageActor } from "@/lib/auth/page-guard";
import { ROLE_LABELS, plural } from "@/lib/domain";
import { getUsersPage } from "@/lib/services/users";
import { PageHeader, Panel } from "@/components/ui/panel";
import { Badge } from "@/components/ui/badge";
import { CreateUserForm, UserRowActions } from "@/components/admin/user-forms";
import { formatDateTime } from "@/lib/format";
import { TableFrame } from "@/components/ui/table-frame";

export const metadata = { title: "Users" };

export default async function UsersPage() {
  const user = await requirePageActor("users:manage");
  const { rows, timeZone } = await getUsersPage({ actor: user });
  return (
    <>
      <PageHeader title="Users" subtitle="Accounts, roles and access. New accounts and password resets get a one-time password, shown once. Every change is written to the audit ledger." />
      <div className="grid gap-gutter">
        <Panel title={plural(rows.length, "account")}>
          <TableFrame label="Accounts">
            <table className="data-table" data-testid="users-table">
              <thead>
                <tr>
                  <th>Name</th>
                  <th>E-mail</th>
                  <th>Role</th>
                  <th>State</th>
                  <th>Last sign-in</th>
                  <th>
                    <span className="sr-only">Actions</span>
                  </th>
                </tr>
              </thead>
              <tbody>
                {rows.map((u) => (
                  <tr key={u.id}>
                    <td className="font-medium">{u.name}</td>
                    <td className="mono">{u.email}</td>
                    <td>{ROLE_LABELS[u.role]}</td>
                    <td>
                      <div className="flex flex-wrap gap-1">
                        {u.disabled ? <Badge tone="fail">Disabled</Badge> : <Badge tone="pass">Active</Badge>}
                        {u.signInLockedUntil && <Badge tone="fail">Sign-in locked until {formatDateTime(u.signInLockedUntil, timeZone)}</Badge>}
                        {u.signingLockedUntil && <Badge tone="caution">Signing locked until {formatDateTime(u.signingLockedUntil, timeZone)}</Badge>}
                        {u.mustChangePassword && <Badge tone="caution">One-time password</Badge>}
                      </div>
                    </td>
                    <td className="text-xs text-ink-muted">{formatDateTime(u.lastSignInAt, timeZone)}</td>
                    <td>
                      <UserRowActions user={{ id: u.id, name: u.name, role: u.role, disabled: u.disabled, locked: Boolean(u.signInLockedUntil || u.signingLockedUntil) }} self={u.id === user.id} />
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </TableFrame>
        </Panel>
        <Panel title="Add a user" className="max-w-xl">
          <CreateUserForm />
        </Panel>
      </div>
    </>
  );
}

import { requirePageActor } from "@/lib/auth/page-guard";
import { ROLE_LABELS } from "@/lib/domain";
import { listUsers } from "@/lib/services/users";
import { PageHeader, Panel } from "@/components/ui/panel";
import { Badge } from "@/components/ui/badge";
import { CreateUserForm, UserRowActions } from "@/components/admin/user-forms";
import { formatDateTime } from "@/lib/format";

export const metadata = { title: "Users" };

export default async function UsersPage() {
  const user = await requirePageActor("users:manage");
  const rows = await listUsers({ actor: user });
  return (
    <>
      <PageHeader title="Users" subtitle="Accounts, roles and access. Every change is written to the audit ledger." />
      <div className="grid gap-gutter xl:grid-cols-[1fr_22rem]">
        <Panel title={`${rows.length} accounts`}>
          <div className="overflow-x-auto">
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
                    <td>{u.disabled ? <Badge tone="fail">Disabled</Badge> : <Badge tone="pass">Active</Badge>}</td>
                    <td className="text-xs text-ink-muted">{formatDateTime(u.lastSignInAt)}</td>
                    <td>
                      <UserRowActions user={{ id: u.id, name: u.name, role: u.role, disabled: u.disabled }} self={u.id === user.id} />
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </Panel>
        <Panel title="Add a user">
          <CreateUserForm />
        </Panel>
      </div>
    </>
  );
}

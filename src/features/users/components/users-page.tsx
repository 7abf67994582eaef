import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { createColumnHelper } from "@tanstack/react-table";
import { CreateUserSchema, type CreateUserInput, type UserDetail } from "../../../../shared/users/users.schemas";
import { ROLES, ROLE_LABELS, type Role } from "../../../../shared/auth/roles";
import { useCreateUser, useResetPassword, useUpdateUser, useUsers } from "../api/users";
import { PageHeader, Card, ErrorNote } from "../../../components/ui/layout";
import { DataTable, pagedProps } from "../../../components/ui/data-table";
import { TextField, SelectField } from "../../../components/ui/field";
import { Button } from "../../../components/ui/button";
import { errorMessage } from "../../../lib/api-client";
import { useListParams } from "../../../lib/use-list-params";
import { FilterSelect } from "../../../components/ui/filter-select";
import { RoleNotice } from "../../../components/ui/role-notice";
import { useCan, useRoleName } from "../../auth/api/auth";

const col = createColumnHelper<UserDetail>();

/** People and roles: administrators manage them; any other role opening the page by URL is told so plainly. */
export function UsersPage() {
  const canManage = useCan("users.manage");
  const roleName = useRoleName();
  if (!canManage) {
    return (
      <div>
        <PageHeader title="People and roles" subtitle="Who may sign in to Tenthwise, and what each may do." />
        <RoleNotice roleName={roleName}>cannot see or change the list of people; an administrator adds people and sets their roles.</RoleNotice>
      </div>
    );
  }
  return <ManagePeople />;
}

function ManagePeople() {
  const list = useListParams(["q", "role"] as const);
  const users = useUsers({ q: list.filters.q, role: list.filters.role, page: list.page });
  const update = useUpdateUser();
  const reset = useResetPassword();
  const [message, setMessage] = useState<string | null>(null);

  const columns = [
    col.accessor("name", { header: "Name" }),
    col.accessor("email", { header: "E-mail" }),
    col.accessor("role", {
      header: "Role",
      cell: (c) => (
        <select
          aria-label={`Role of ${c.row.original.name}`}
          className="rounded border border-paper-line bg-paper-raised px-2 py-1"
          value={c.getValue()}
          onChange={(e) => update.mutate({ id: c.row.original.id, patch: { role: e.target.value as Role } }, { onError: (err) => setMessage(errorMessage(err)) })}
        >
          {ROLES.map((r) => (
            <option key={r} value={r}>
              {ROLE_LABELS[r]}
            </option>
          ))}
        </select>
      ),
    }),
    col.accessor("badgeCode", { header: "Badge" }),
    col.accessor("certificateNumber", { header: "Certificate no." }),
    col.accessor("active", { header: "Active", cell: (c) => (c.getValue() ? "Yes" : "Deactivated") }),
    col.display({
      id: "actions",
      header: "Actions",
      cell: (c) => {
        const u = c.row.original;
        return (
          <div className="flex gap-2">
            <Button
              variant="secondary"
              onClick={() => update.mutate({ id: u.id, patch: { active: !u.active } }, { onError: (err) => setMessage(errorMessage(err)) })}
            >
              {u.active ? "Deactivate" : "Reactivate"}
            </Button>
            <Button
              variant="ghost"
              onClick={() => {
                const pw = window.prompt(`New password for ${u.name} (at least 10 characters)`);
                if (pw) reset.mutate({ id: u.id, password: pw }, { onSuccess: () => setMessage(`Password of ${u.name} reset; their sessions were ended.`), onError: (err) => setMessage(errorMessage(err)) });
              }}
            >
              Reset password
            </Button>
          </div>
        );
      },
    }),
  ];

  return (
    <div>
      <PageHeader title="People and roles" subtitle="Who may sign in to Tenthwise, and what each may do." />
      {message && <p className="mb-3 rounded-md bg-brass-light px-3 py-2 text-sm" role="status">{message}</p>}
      <div className="grid gap-5 xl:grid-cols-[minmax(0,1fr)_22rem]">
        <DataTable
          label="People"
          columns={columns}
          {...pagedProps(users, list, 50)}
          rowKey={(u) => u.id}
          toolbar={
            <>
              <input aria-label="Search people" placeholder="Search name or e-mail" className="rounded-md border border-paper-line px-3 py-1.5" defaultValue={list.filters.q} onChange={(e) => list.setFilter("q", e.target.value)} />
              <FilterSelect label="Filter by role" all="All roles" options={ROLES} labels={ROLE_LABELS} value={list.filters.role} onChange={(v) => list.setFilter("role", v)} />
            </>
          }
        />
        <NewUserCard />
      </div>
    </div>
  );
}

function NewUserCard() {
  const create = useCreateUser();
  const form = useForm<CreateUserInput>({ resolver: zodResolver(CreateUserSchema), defaultValues: { email: "", name: "", role: "mechanic", password: "" } });
  const e = form.formState.errors;
  return (
    <Card title="Add a person">
      <form
        noValidate
        className="flex flex-col gap-3"
        onSubmit={form.handleSubmit((v) => create.mutate(v, { onSuccess: () => form.reset() }))}
      >
        <TextField label="Name" error={e.name?.message} {...form.register("name")} />
        <TextField label="E-mail" type="email" error={e.email?.message} {...form.register("email")} />
        <SelectField label="Role" error={e.role?.message} {...form.register("role")}>
          {ROLES.map((r) => (
            <option key={r} value={r}>
              {ROLE_LABELS[r]}
            </option>
          ))}
        </SelectField>
        <TextField label="Badge code (optional)" {...form.register("badgeCode")} />
        <TextField label="Inspector certificate no. (optional)" {...form.register("certificateNumber")} />
        <TextField label="First password" type="password" autoComplete="new-password" error={e.password?.message} {...form.register("password")} />
        {create.isError && <ErrorNote>{errorMessage(create.error)}</ErrorNote>}
        {create.isSuccess && <p role="status" className="text-sm text-go">Added {create.data.name}.</p>}
        <Button type="submit" disabled={create.isPending}>
          Add person
        </Button>
      </form>
    </Card>
  );
}

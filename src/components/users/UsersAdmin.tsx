import { useMemo, useState } from "react";
import { formatDateTime } from "../../lib/format";
import { ROLE_LABELS, ROLES, type Role } from "../../lib/permissions";
import type { ClientOption, UserRow } from "../../lib/users/types";
import { HydratedControls } from "../forms/island-form";
import { errorMessage, postJson } from "../forms/post-json";
import { InviteForm } from "./InviteForm";
import { RoleEditor } from "./RoleEditor";

interface Props {
  users: UserRow[];
  clients: ClientOption[];
  /** The signed-in manager or administrator. */
  actor: { id: number; role: Role };
}

type SortKey = "name" | "role" | "organisation" | "state" | "lastSignIn";
const COLUMNS: { key: SortKey; label: string }[] = [
  { key: "name", label: "Person" },
  { key: "role", label: "Role" },
  { key: "organisation", label: "Organisation" },
  { key: "state", label: "State" },
  { key: "lastSignIn", label: "Last sign-in" },
];

const SMALL = "btn btn-quiet px-2 py-1 text-[0.8rem]";

const stateOf = (u: UserRow) => (!u.active ? "deactivated" : u.invited ? "invited" : "active");
const sortValue = (u: UserRow, key: SortKey): string => {
  switch (key) {
    case "name":
      return u.name.toLowerCase();
    case "role":
      return String(ROLES.indexOf(u.role));
    case "organisation":
      return (u.clientName ?? "").toLowerCase();
    case "state":
      return stateOf(u);
    case "lastSignIn":
      return u.lastSignInAt ?? "";
  }
};

async function refreshUsers(): Promise<UserRow[]> {
  const response = await fetch("/api/users");
  if (!response.ok) throw new Error(`Could not reload the list (${response.status}).`);
  return ((await response.json()) as { items: UserRow[] }).items;
}

export default function UsersAdmin({ users: initial, clients, actor }: Props) {
  const [users, setUsers] = useState(initial);
  const [sort, setSort] = useState<{ key: SortKey; ascending: boolean }>({ key: "name", ascending: true });
  const [inviting, setInviting] = useState(false);
  const [editing, setEditing] = useState<number | null>(null);
  const [confirming, setConfirming] = useState<number | null>(null);
  const [notice, setNotice] = useState<{ text: string; warning: boolean } | null>(null);

  const sorted = useMemo(() => {
    const rows = [...users].sort((a, b) => sortValue(a, sort.key).localeCompare(sortValue(b, sort.key)) || a.name.localeCompare(b.name));
    return sort.ascending ? rows : rows.reverse();
  }, [users, sort]);

  async function reload(text: string, warning = false) {
    setNotice({ text, warning });
    try {
      setUsers(await refreshUsers());
    } catch (error) {
      setNotice({ text: errorMessage(error), warning: true });
    }
  }

  async function act(request: () => Promise<unknown>, success: string) {
    setNotice(null);
    try {
      await request();
      await reload(success);
    } catch (error) {
      setNotice({ text: errorMessage(error), warning: true });
    }
  }

  const mayChange = (u: UserRow) => u.id !== actor.id && (actor.role === "admin" || u.role !== "admin");

  return (
    <div className="flex flex-col gap-5">
      <HydratedControls>
        <div>
          <button className="btn" type="button" aria-expanded={inviting} onClick={() => setInviting(!inviting)}>
            {inviting ? "Close the invitation form" : "Invite a person"}
          </button>
        </div>
        {inviting && <InviteForm clients={clients} actorRole={actor.role} onInvited={(text, warning) => reload(text, warning)} />}
        {notice && (
          <p
            className={notice.warning ? "notice notice-danger" : "notice border-l-[var(--color-ok)] bg-[var(--color-ok-wash)]"}
            role="status"
          >
            {notice.text}
          </p>
        )}
        <div className="card relative overflow-x-auto">
          <table className="table" aria-label="People with a Decant account">
            <thead>
              <tr>
                {COLUMNS.map((c) => (
                  <th key={c.key} aria-sort={sort.key === c.key ? (sort.ascending ? "ascending" : "descending") : "none"}>
                    <button
                      type="button"
                      className="inline-flex items-center gap-1 uppercase tracking-[0.04em] hover:text-[var(--color-teal)]"
                      onClick={() => setSort({ key: c.key, ascending: sort.key === c.key ? !sort.ascending : true })}
                    >
                      {c.label}
                      <span aria-hidden="true" className="text-[0.7rem]">
                        {sort.key === c.key ? (sort.ascending ? "▲" : "▼") : "↕"}
                      </span>
                    </button>
                  </th>
                ))}
                <th>
                  <span className="sr-only">Actions</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {sorted.map((u) => (
                <tr key={u.id} data-user={u.email}>
                  <td>
                    <span className="font-medium">{u.name}</span>
                    {u.id === actor.id && <span className="tag tag-muted ml-2">you</span>}
                    <br />
                    <span className="text-sm text-[var(--color-muted)]">{u.email}</span>
                  </td>
                  <td className="whitespace-nowrap">{ROLE_LABELS[u.role]}</td>
                  <td>{u.clientName ?? <span className="text-[var(--color-muted)]">—</span>}</td>
                  <td>
                    {stateOf(u) === "active" && <span className="tag">active</span>}
                    {stateOf(u) === "invited" && <span className="tag tag-amber">invited</span>}
                    {stateOf(u) === "deactivated" && <span className="tag tag-muted">deactivated</span>}
                  </td>
                  <td className="whitespace-nowrap">
                    {u.lastSignInAt ? formatDateTime(u.lastSignInAt) : <span className="text-[var(--color-muted)]">never</span>}
                  </td>
                  <td className="min-w-[21rem]">
                    {mayChange(u) && editing === u.id ? (
                      <RoleEditor
                        user={u}
                        clients={clients}
                        actorRole={actor.role}
                        onCancel={() => setEditing(null)}
                        onDone={async (updated) => {
                          setEditing(null);
                          await reload(
                            `${updated.name} is now ${ROLE_LABELS[updated.role]}${updated.clientName ? ` of ${updated.clientName}` : ""}.`,
                          );
                        }}
                      />
                    ) : mayChange(u) && confirming === u.id ? (
                      <div className="flex flex-wrap items-center gap-2" role="group" aria-label={`Confirm deactivating ${u.name}`}>
                        <span className="text-sm">Deactivate {u.name}? They are signed out at once.</span>
                        <button
                          className="btn bg-[var(--color-danger)] border-[var(--color-danger)]"
                          type="button"
                          onClick={() => {
                            setConfirming(null);
                            void act(
                              () => postJson(`/api/users/${u.id}`, { active: false }, "PATCH"),
                              `${u.name} is deactivated and signed out.`,
                            );
                          }}
                        >
                          Yes, deactivate
                        </button>
                        <button className="btn btn-quiet" type="button" onClick={() => setConfirming(null)}>
                          Keep
                        </button>
                      </div>
                    ) : mayChange(u) ? (
                      <div className="flex flex-wrap gap-1.5">
                        {u.active && (
                          <button
                            className={SMALL}
                            type="button"
                            onClick={() => {
                              setConfirming(null);
                              setEditing(u.id);
                            }}
                            aria-label={`Change role of ${u.name}`}
                          >
                            Change role
                          </button>
                        )}
                        {u.active ? (
                          <button
                            className={SMALL}
                            type="button"
                            onClick={() => {
                              setEditing(null);
                              setConfirming(u.id);
                            }}
                            aria-label={`Deactivate ${u.name}`}
                          >
                            Deactivate
                          </button>
                        ) : (
                          <button
                            className={SMALL}
                            type="button"
                            onClick={() =>
                              void act(() => postJson(`/api/users/${u.id}`, { active: true }, "PATCH"), `${u.name} is active again.`)
                            }
                            aria-label={`Reactivate ${u.name}`}
                          >
                            Reactivate
                          </button>
                        )}
                        {u.active && (
                          <button
                            className={SMALL}
                            type="button"
                            onClick={() =>
                              void act(
                                () => postJson(`/api/users/${u.id}/link`, {}),
                                u.invited ? `A new invitation is on its way to ${u.email}.` : `A reset link is on its way to ${u.email}.`,
                              )
                            }
                            aria-label={`Send ${u.name} a new link`}
                          >
                            {u.invited ? "Resend invitation" : "Send reset link"}
                          </button>
                        )}
                        {u.active && u.twoFactor && (
                          <button
                            className={SMALL}
                            type="button"
                            onClick={() =>
                              void act(
                                () => postJson(`/api/users/${u.id}/two-factor`, {}, "DELETE"),
                                `Two-factor sign-in is off for ${u.name}, who is signed out; they set it up again at their next sign-in if their role requires it.`,
                              )
                            }
                            aria-label={`Turn off two-factor sign-in for ${u.name} (lost phone and recovery codes)`}
                          >
                            Reset two-factor
                          </button>
                        )}
                      </div>
                    ) : null}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </HydratedControls>
    </div>
  );
}

import { useState } from "react";
import type { Role } from "../../lib/permissions";
import type { ClientOption, UserRow } from "../../lib/users/types";
import { errorMessage, postJson } from "../forms/post-json";
import { roleOptions } from "./role-options";

/** Changes one person's role (and, for a client contact, their organisation). */
export function RoleEditor({
  user,
  clients,
  actorRole,
  onDone,
  onCancel,
}: {
  user: UserRow;
  clients: ClientOption[];
  actorRole: Role;
  onDone: (u: UserRow) => Promise<void>;
  onCancel: () => void;
}) {
  const [role, setRole] = useState<Role>(user.role);
  const [clientId, setClientId] = useState<string>(user.clientId ? String(user.clientId) : "");
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function save() {
    setProblem(null);
    setBusy(true);
    try {
      const { user: updated } = await postJson<{ user: UserRow }>(
        `/api/users/${user.id}`,
        { role, clientId: role === "client" ? clientId : null },
        "PATCH",
      );
      await onDone(updated);
    } catch (error) {
      setProblem(errorMessage(error));
    } finally {
      setBusy(false);
    }
  }

  return (
    <div className="flex flex-wrap items-end gap-3" role="group" aria-label={`Change the role of ${user.name}`}>
      <div className="field">
        <label htmlFor={`role-${user.id}`}>New role</label>
        <select id={`role-${user.id}`} className="input" value={role} onChange={(e) => setRole(e.target.value as Role)}>
          {roleOptions(actorRole).map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </select>
      </div>
      {role === "client" && (
        <div className="field">
          <label htmlFor={`client-${user.id}`}>Client organisation</label>
          <select id={`client-${user.id}`} className="input" value={clientId} onChange={(e) => setClientId(e.target.value)}>
            <option value="">Choose…</option>
            {clients.map((c) => (
              <option key={c.id} value={c.id}>
                {c.name}
              </option>
            ))}
          </select>
        </div>
      )}
      <button className="btn" type="button" onClick={save} disabled={busy}>
        Save role
      </button>
      <button className="btn btn-quiet" type="button" onClick={onCancel}>
        Cancel
      </button>
      <p className="w-full text-xs text-[var(--color-muted)]">
        Changing the role signs {user.name} out everywhere, so the new role applies at once.
      </p>
      {problem && (
        <p className="notice notice-danger w-full" role="alert">
          {problem}
        </p>
      )}
    </div>
  );
}

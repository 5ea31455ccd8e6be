import { useState } from "react";
import type { Role } from "../../lib/permissions";
import { inviteUserSchema, type InviteUserInput } from "../../lib/schemas/auth";
import type { ClientOption, UserRow } from "../../lib/users/types";
import { Field, SelectField, useZodForm } from "../forms/form";
import { IslandForm } from "../forms/island-form";
import { postJson } from "../forms/post-json";
import { useServerErrors } from "../forms/server-errors";
import { roleOptions } from "./role-options";

/** Invites a person by e-mail; a refused invitation (an address already in use) shows at its field. */
export function InviteForm({
  clients,
  actorRole,
  onInvited,
}: {
  clients: ClientOption[];
  actorRole: Role;
  onInvited: (message: string, warning: boolean) => Promise<void>;
}) {
  const form = useZodForm<InviteUserInput>(inviteUserSchema, { defaultValues: { role: "technician" } });
  const { register, handleSubmit, formState, watch, reset } = form;
  const showServerError = useServerErrors(form);
  const [problem, setProblem] = useState<string | null>(null);
  const role = watch("role");

  const onSubmit = handleSubmit(async (values) => {
    setProblem(null);
    try {
      const result = await postJson<{ user: UserRow; mailSent: boolean }>("/api/users", values);
      reset({ email: "", name: "", role: values.role });
      await onInvited(
        result.mailSent
          ? `Invitation sent to ${result.user.email}.`
          : `${result.user.email} was added, but the invitation could not be mailed. Use "Send link" once mail works.`,
        !result.mailSent,
      );
    } catch (error) {
      setProblem(showServerError(error));
    }
  });

  return (
    <IslandForm
      method="post"
      onSubmit={onSubmit}
      noValidate
      aria-label="Invite a person"
      className="card grid gap-4 p-5 sm:grid-cols-2 [&>fieldset>*]:min-w-0 [&_.input]:w-full [&_.input]:min-w-0"
    >
      <Field label="Name" autoComplete="off" registration={register("name")} error={formState.errors.name?.message} />
      <Field
        label="E-mail address"
        type="email"
        autoComplete="off"
        registration={register("email")}
        error={formState.errors.email?.message}
      />
      <SelectField label="Role" registration={register("role")} options={roleOptions(actorRole)} error={formState.errors.role?.message} />
      {role === "client" ? (
        <SelectField
          label="Client organisation"
          registration={register("clientId")}
          placeholder="Choose…"
          options={clients.map((c) => ({ value: c.id, label: `${c.name}${c.kind === "internal" ? " (internal)" : ""}` }))}
          error={formState.errors.clientId?.message}
        />
      ) : (
        <p className="self-end text-sm text-[var(--color-muted)]">Only client contacts belong to a client organisation.</p>
      )}
      {problem && (
        <p className="notice notice-danger sm:col-span-2" role="alert">
          {problem}
        </p>
      )}
      <div className="sm:col-span-2">
        <button className="btn" type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? "Sending…" : "Send invitation"}
        </button>
        <span className="ml-3 text-sm text-[var(--color-muted)]">The link in the e-mail works once, for 48 hours.</span>
      </div>
    </IslandForm>
  );
}

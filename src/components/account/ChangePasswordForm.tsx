import { useState } from "react";
import { changePasswordSchema, type ChangePasswordInput } from "../../lib/schemas/auth";
import { Field, useZodForm } from "../forms/form";
import { IslandForm } from "../forms/island-form";
import { postJson } from "../forms/post-json";
import { useServerErrors } from "../forms/server-errors";

export default function ChangePasswordForm({ email }: { email: string }) {
  const form = useZodForm<ChangePasswordInput>(changePasswordSchema);
  const { register, handleSubmit, formState, reset } = form;
  const showServerError = useServerErrors(form);
  const [done, setDone] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);

  const onSubmit = handleSubmit(async (values) => {
    setProblem(null);
    setDone(false);
    try {
      await postJson("/api/account/password", values);
      reset({ currentPassword: "", newPassword: "", confirmPassword: "" });
      setDone(true);
    } catch (error) {
      setProblem(showServerError(error));
    }
  });

  return (
    <IslandForm method="post" onSubmit={onSubmit} noValidate className="flex max-w-sm flex-col gap-4" aria-label="Change password">
      <input type="email" name="username" autoComplete="username" value={email} readOnly hidden />
      <Field
        label="Current password"
        type="password"
        autoComplete="current-password"
        registration={register("currentPassword")}
        error={formState.errors.currentPassword?.message}
      />
      <Field
        label="New password"
        type="password"
        autoComplete="new-password"
        registration={register("newPassword")}
        error={formState.errors.newPassword?.message}
        hint="At least 12 characters."
      />
      <Field
        label="Repeat the new password"
        type="password"
        autoComplete="new-password"
        registration={register("confirmPassword")}
        error={formState.errors.confirmPassword?.message}
      />
      {problem && (
        <p className="notice notice-danger" role="alert">
          {problem}
        </p>
      )}
      {done && (
        <p className="notice border-l-[var(--color-ok)] bg-[var(--color-ok-wash)]" role="status">
          Password changed. You stay signed in here; every other browser signed in to your account has been signed out.
        </p>
      )}
      <div>
        <button className="btn" type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? "Saving…" : "Change password"}
        </button>
      </div>
    </IslandForm>
  );
}

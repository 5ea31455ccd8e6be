import { useState } from "react";
import { setPasswordSchema, type SetPasswordInput } from "../../lib/schemas/auth";
import { Field, useZodForm } from "../forms/form";
import { IslandForm } from "../forms/island-form";
import { postJson } from "../forms/post-json";
import { useServerErrors } from "../forms/server-errors";

export default function SetPasswordForm({ token, email }: { token: string; email: string }) {
  const form = useZodForm<SetPasswordInput>(setPasswordSchema, { defaultValues: { token } });
  const { register, handleSubmit, formState } = form;
  const showServerError = useServerErrors(form);
  const [problem, setProblem] = useState<string | null>(null);

  const onSubmit = handleSubmit(async (values) => {
    setProblem(null);
    try {
      await postJson("/api/auth/set-password", values);
      window.location.assign(`/sign-in?password-set=1&email=${encodeURIComponent(email)}`);
    } catch (error) {
      setProblem(showServerError(error));
    }
  });

  return (
    <IslandForm method="post" onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Choose a password">
      <input type="hidden" {...register("token")} />
      {/* Lets password managers file the new password under the right account. */}
      <input type="email" name="username" autoComplete="username" value={email} readOnly hidden />
      <Field
        label="New password"
        type="password"
        autoComplete="new-password"
        registration={register("newPassword")}
        error={formState.errors.newPassword?.message}
        hint="At least 12 characters; a few unrelated words make a good one."
      />
      <Field
        label="Repeat the new password"
        type="password"
        autoComplete="new-password"
        registration={register("confirmPassword")}
        error={formState.errors.confirmPassword?.message}
      />
      {(problem || formState.errors.token) && (
        <p className="notice notice-danger" role="alert">
          {problem ?? formState.errors.token?.message}
        </p>
      )}
      <button className="btn justify-center" type="submit" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Saving…" : "Set password"}
      </button>
    </IslandForm>
  );
}

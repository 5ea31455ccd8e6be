import { useState } from "react";
import { signInSchema, type SignInInput } from "../../lib/schemas/auth";
import { Field, useZodForm } from "../forms/form";
import { IslandForm } from "../forms/island-form";
import { postJson } from "../forms/post-json";
import { useServerErrors } from "../forms/server-errors";

export default function SignInForm({ next, email = "" }: { next: string; email?: string }) {
  // No defaultValues: react-hook-form would then overwrite what was typed before hydration.
  const form = useZodForm<SignInInput>(signInSchema);
  const { register, handleSubmit, formState } = form;
  const showServerError = useServerErrors(form);
  const [problem, setProblem] = useState<string | null>(null);

  const onSubmit = handleSubmit(async (values) => {
    setProblem(null);
    try {
      await postJson("/api/auth/sign-in", values);
      window.location.assign(next);
    } catch (error) {
      setProblem(showServerError(error));
    }
  });

  return (
    <IslandForm method="post" onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Sign in">
      <Field
        label="E-mail address"
        type="email"
        autoComplete="username"
        defaultValue={email || undefined}
        registration={register("email")}
        error={formState.errors.email?.message}
      />
      <Field
        label="Password"
        type="password"
        autoComplete="current-password"
        registration={register("password")}
        error={formState.errors.password?.message}
      />
      {problem && (
        <p className="notice notice-danger" role="alert">
          {problem}
        </p>
      )}
      <button className="btn justify-center" type="submit" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Signing in…" : "Sign in"}
      </button>
    </IslandForm>
  );
}

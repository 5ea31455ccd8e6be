import { useState } from "react";
import { forgotPasswordSchema, type ForgotPasswordInput } from "../../lib/schemas/auth";
import { Field, useZodForm } from "../forms/form";
import { IslandForm } from "../forms/island-form";
import { postJson } from "../forms/post-json";
import { useServerErrors } from "../forms/server-errors";

export default function ForgotPasswordForm() {
  const form = useZodForm<ForgotPasswordInput>(forgotPasswordSchema);
  const { register, handleSubmit, formState } = form;
  const showServerError = useServerErrors(form);
  const [answer, setAnswer] = useState<string | null>(null);
  const [problem, setProblem] = useState<string | null>(null);

  const onSubmit = handleSubmit(async (values) => {
    setProblem(null);
    try {
      const { message } = await postJson<{ message: string }>("/api/auth/forgot-password", values);
      setAnswer(message);
    } catch (error) {
      setProblem(showServerError(error));
    }
  });

  if (answer) {
    return (
      <div className="flex flex-col gap-4">
        <p className="notice" role="status">
          {answer}
        </p>
        <p className="text-sm">
          <a href="/sign-in">Back to sign-in</a>
        </p>
      </div>
    );
  }

  return (
    <IslandForm method="post" onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Forgotten password">
      <Field
        label="E-mail address"
        type="email"
        autoComplete="username"
        registration={register("email")}
        error={formState.errors.email?.message}
      />
      {problem && (
        <p className="notice notice-danger" role="alert">
          {problem}
        </p>
      )}
      <button className="btn justify-center" type="submit" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Sending…" : "Send me a link"}
      </button>
    </IslandForm>
  );
}

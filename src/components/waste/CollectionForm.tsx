import { useState } from "react";
import { collectionSchema, type CollectionInput } from "../../lib/schemas/waste";
import { Field, useZodForm } from "../forms/form";
import { IslandForm } from "../forms/island-form";
import { postJson } from "../forms/post-json";
import { useServerErrors } from "../forms/server-errors";

/** Records that a requested pickup was collected, with the manifest or reference number. */
export default function CollectionForm({ pickupId, reference }: { pickupId: number; reference: string }) {
  const form = useZodForm<CollectionInput>(collectionSchema, { defaultValues: { note: null } });
  const { register, handleSubmit, formState } = form;
  const showServerError = useServerErrors(form);
  const [problem, setProblem] = useState<string | null>(null);
  const onSubmit = handleSubmit(async (values) => {
    setProblem(null);
    try {
      await postJson(`/api/waste/pickups/${pickupId}/collection`, { ...values, note: values.note || null });
      window.location.reload();
    } catch (error) {
      setProblem(showServerError(error));
    }
  });
  return (
    <IslandForm onSubmit={onSubmit} noValidate className="flex flex-wrap items-end gap-3" aria-label={`Record collection of ${reference}`}>
      <Field
        label="Manifest or reference number"
        registration={register("manifestRef")}
        error={formState.errors.manifestRef?.message}
        maxLength={64}
      />
      <Field label="Note (optional)" registration={register("note")} error={formState.errors.note?.message} maxLength={255} />
      <button className="btn" type="submit" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Saving…" : "Record collection"}
      </button>
      {problem && (
        <p className="notice notice-danger w-full" role="alert">
          {problem}
        </p>
      )}
    </IslandForm>
  );
}

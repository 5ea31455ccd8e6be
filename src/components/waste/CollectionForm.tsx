import { useRef, useState } from "react";
import { ConfirmAction } from "../common/ConfirmAction";
import { collectionSchema, type CollectionInput } from "../../lib/schemas/waste";
import { Field, useZodForm } from "../forms/form";
import { IslandForm } from "../forms/island-form";
import { postJson } from "../forms/post-json";
import { useServerErrors } from "../forms/server-errors";

interface CollectedContainer {
  code: string;
  stream: string;
  estimated_mL: number;
}

const litres = (mL: number) => `${(mL / 1000).toFixed(1)} L`;

/** Records that a requested pickup was collected, with the manifest or reference number, after a confirmation that lists what leaves. */
export default function CollectionForm({
  pickupId,
  reference,
  containers = [],
}: {
  pickupId: number;
  reference: string;
  containers?: CollectedContainer[];
}) {
  const form = useZodForm<CollectionInput>(collectionSchema, { defaultValues: { note: null } });
  const { register, handleSubmit, formState } = form;
  const showServerError = useServerErrors(form);
  const [problem, setProblem] = useState<string | null>(null);
  const problemRef = useRef<string | null>(null);
  const onSubmit = handleSubmit(async (values) => {
    setProblem(null);
    problemRef.current = null;
    try {
      await postJson(`/api/waste/pickups/${pickupId}/collection`, { ...values, note: values.note || null });
      window.location.reload();
    } catch (error) {
      problemRef.current = showServerError(error);
      setProblem(problemRef.current);
    }
  });
  return (
    <IslandForm
      onSubmit={(event) => event.preventDefault()}
      noValidate
      className="flex flex-wrap items-end gap-3"
      aria-label={`Record collection of ${reference}`}
    >
      <Field
        label="Manifest or reference number"
        registration={register("manifestRef")}
        error={formState.errors.manifestRef?.message}
        maxLength={64}
      />
      <Field label="Note (optional)" registration={register("note")} error={formState.errors.note?.message} maxLength={255} />
      <ConfirmAction
        label="Record collection"
        buttonClassName="btn"
        title={`Record the collection of pickup ${reference}?`}
        consequences={[
          ...containers.map((c) => `${c.code} (${c.stream}, about ${litres(c.estimated_mL)}) is recorded as collected and starts empty.`),
          `${litres(containers.reduce((a, c) => a + c.estimated_mL, 0))} in all leave the waste totals on hand; the manifest number goes on the record.`,
          "A collection cannot be undone here: it is part of the waste record. Correct a mistake with your safety officer.",
        ]}
        confirmLabel="Record collection"
        onConfirm={async () => {
          if (!(await form.trigger())) throw new Error("Fill in the manifest or reference number first (the field is marked).");
          await onSubmit();
          if (problemRef.current) throw new Error(problemRef.current);
        }}
      />
      {problem && (
        <p className="notice notice-danger w-full" role="alert">
          {problem}
        </p>
      )}
    </IslandForm>
  );
}

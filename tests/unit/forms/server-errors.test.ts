// A refused submit shows beside the fields it names: the answer's `fields` map reaches
// react-hook-form's errors (nested paths too), and only what the form cannot place stays on its
// own line. Runs on a real react-hook-form control, without a browser.
import { createFormControl } from "react-hook-form";
import { describe, expect, it } from "vitest";
import { ApiError, errorMessage, readAnswer } from "../../../src/components/forms/post-json";
import { showServerErrors } from "../../../src/components/forms/server-errors";

interface Batch {
  volume_mL: number;
  room: string;
  alsoAccepts: string;
  components: { reagent: string; stockLotId: number }[];
}

function batchForm() {
  return createFormControl<Batch>({
    defaultValues: {
      volume_mL: 1000,
      room: "",
      alsoAccepts: "aqueous, other",
      components: [
        { reagent: "water", stockLotId: 3 },
        { reagent: "formic-acid", stockLotId: 0 },
      ],
    },
  });
}
const errorAt = (form: ReturnType<typeof batchForm>, name: Parameters<ReturnType<typeof batchForm>["getFieldState"]>[0]) =>
  form.getFieldState(name).error?.message;

describe("showServerErrors", () => {
  it("puts each named field's message on that field, nested paths included, and leaves nothing for the form's line", () => {
    const form = batchForm();
    const line = showServerErrors(
      form,
      new ApiError(400, "components.1.stockLotId: Lot L-7 is expired; room: no such room", {
        "components.1.stockLotId": "Lot L-7 is expired",
        room: "no such room",
      }),
    );
    expect(line).toBeNull();
    expect(errorAt(form, "components.1.stockLotId")).toBe("Lot L-7 is expired");
    expect(errorAt(form, "components.0.stockLotId")).toBeUndefined();
    expect(errorAt(form, "room")).toBe("no such room");
  });

  it("keeps the message on the form's line when the refusal names no field the form holds", () => {
    const form = batchForm();
    expect(showServerErrors(form, new ApiError(409, "Version 3 is approved already."))).toBe("Version 3 is approved already.");
    expect(showServerErrors(form, new ApiError(400, "body: not valid JSON", { body: "not valid JSON" }))).toBe("body: not valid JSON");
    expect([errorAt(form, "room"), errorAt(form, "volume_mL"), errorAt(form, "components")]).toEqual([undefined, undefined, undefined]);
  });

  it("places what it can and names the rest on the form's line, e.g. an item of a list the form edits as text", () => {
    const form = batchForm();
    const line = showServerErrors(
      form,
      new ApiError(400, "…", { volume_mL: "At most 100 L in one batch", "alsoAccepts.0": "use lower-case letters" }),
    );
    expect(errorAt(form, "volume_mL")).toBe("At most 100 L in one batch");
    expect(line).toBe("alsoAccepts.0: use lower-case letters");
  });

  it("turns anything else thrown into a sentence", () => {
    const form = batchForm();
    expect(showServerErrors(form, new TypeError("Failed to fetch"))).toBe("Failed to fetch");
    expect(showServerErrors(form, "plain text")).toBe("plain text");
  });
});

describe("readAnswer and errorMessage", () => {
  const answer = (status: number, body: unknown) =>
    new Response(JSON.stringify(body), { status, headers: { "content-type": "application/json" } });

  it("throws ApiError with the status, the message and the fields map every 400 carries", async () => {
    const refused = await readAnswer(answer(400, { error: "code: use letters", fields: { code: "use letters" } })).catch((e: unknown) => e);
    expect(refused).toBeInstanceOf(ApiError);
    expect(refused).toMatchObject({ status: 400, message: "code: use letters", fields: { code: "use letters" } });
  });

  it("says the request failed when the answer has no message, and ignores a fields value that is not a map of texts", async () => {
    const refused = await readAnswer(new Response("<html>", { status: 502 })).catch((e: unknown) => e);
    expect(refused).toMatchObject({ status: 502, message: "The request failed (502).", fields: {} });
    const odd = await readAnswer(answer(400, { error: "x: y", fields: ["x"] })).catch((e: unknown) => e);
    expect(odd).toMatchObject({ fields: {} });
  });

  it("returns the JSON of an answer that succeeded", async () => {
    expect(await readAnswer(answer(201, { batch: { id: 7 } }))).toEqual({ batch: { id: 7 } });
    expect(await readAnswer(new Response(null, { status: 204 }))).toBeUndefined();
  });

  it("gives a schema's complaint as field: message", async () => {
    const { z } = await import("zod");
    const parsed = z.object({ name: z.string().min(3, "too short") }).safeParse({ name: "a" });
    expect(errorMessage(parsed.error)).toBe("name: too short");
  });
});

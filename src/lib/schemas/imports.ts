import { z } from "zod";

/** `POST /api/imports?mode=check|commit&fileName=…` with the CSV file as the body. */
export const importQuery = z
  .object({
    /** check: report what would be written; commit: write it all, or nothing. */
    mode: z.enum(["check", "commit"], { errorMap: () => ({ message: "must be check or commit" }) }),
    fileName: z.string().trim().min(1, "name the file").max(255, "is too long").default("upload.csv"),
  })
  .strict();

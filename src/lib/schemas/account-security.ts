import { z } from "zod";

/** A code as typed: spaces and hyphens are ignored, letters are not case-sensitive. */
const typedCode = z
  .string({ required_error: "Enter the code", invalid_type_error: "must be text" })
  .max(40, "is too long")
  .transform((v) => v.replace(/[\s-]/g, "").toUpperCase());

/** Six digits from the authenticator app (RFC 6238). */
export const TOTP_CODE = /^\d{6}$/;
/** A recovery code: 16 base32 characters, shown as four groups of four. */
export const RECOVERY_CODE = /^[A-Z2-7]{16}$/;

/** `POST /api/auth/two-factor`: the second step of a sign-in, with an app code or a recovery code. */
export const secondFactorSchema = z.object({
  code: typedCode.refine((v) => TOTP_CODE.test(v) || RECOVERY_CODE.test(v), "Enter the 6-digit code from your app, or a recovery code"),
});
export type SecondFactorInput = z.infer<typeof secondFactorSchema>;

/** `POST /api/auth/two-factor/confirm`: the first code from the newly added key proves the app has it. */
export const confirmTwoFactorSchema = z.object({
  code: typedCode.refine((v) => TOTP_CODE.test(v), "Enter the 6-digit code your app shows"),
});
export type ConfirmTwoFactorInput = z.infer<typeof confirmTwoFactorSchema>;

const password = z
  .string({ required_error: "Enter your password", invalid_type_error: "must be text" })
  .min(1, "Enter your password")
  .max(200, "is too long");

/**
 * `POST /api/auth/two-factor/setup`. From My account the password is asked again, so a session
 * left open cannot tie the account to someone else's phone; during a sign-in it was just given.
 */
export const startTwoFactorSchema = z.object({ password: password.optional() }).strict();
export type StartTwoFactorInput = z.infer<typeof startTwoFactorSchema>;

/** Turning two-factor off, or new recovery codes: the password again. */
export const passwordAgainSchema = z.object({ password }).strict();
export type PasswordAgainInput = z.infer<typeof passwordAgainSchema>;

/** `DELETE /api/account/sessions`: end every other session, or every one including this. */
export const endSessionsSchema = z.object({
  keep: z.enum(["this", "none"], { errorMap: () => ({ message: 'Say "this" (keep this browser signed in) or "none"' }) }),
});
export type EndSessionsInput = z.infer<typeof endSessionsSchema>;

/** `/api/account/sessions/{handle}`: a session's public handle (never its id, which is the credential). */
export const sessionHandleParams = z.object({
  handle: z.string().regex(/^[0-9a-f]{16}$/, "must be a session handle of 16 hexadecimal characters"),
});

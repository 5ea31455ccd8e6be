import { z } from "zod";
import { ROLES } from "../permissions";
import { id, optionalId } from "./fields";

export const email = z
  .string({ required_error: "Enter your e-mail address", invalid_type_error: "must be text" })
  .trim()
  .toLowerCase()
  .max(254, "is too long")
  .email("Enter a valid e-mail address");

/** Sign-in form and `POST /api/auth/sign-in`. */
export const signInSchema = z.object({
  /** The account's e-mail address. */
  email,
  /** The password; checked, never stored or logged. */
  password: z
    .string({ required_error: "Enter your password", invalid_type_error: "must be text" })
    .min(1, "Enter your password")
    .max(200, "is too long"),
  /** A shared bench computer: the session ends after the short idle limit, and with the browser. */
  sharedBench: z.boolean({ invalid_type_error: "must be true or false" }).optional(),
});
export type SignInInput = z.infer<typeof signInSchema>;

/** A new password: long enough to resist guessing, short enough to hash cheaply. */
export const newPassword = z
  .string({ required_error: "Choose a password", invalid_type_error: "must be text" })
  .min(12, "Use at least 12 characters")
  .max(200, "Use at most 200 characters");

export const changePasswordSchema = z
  .object({
    /** The password in use now; a stolen session alone cannot change it. */
    currentPassword: z.string({ required_error: "Enter your current password" }).min(1, "Enter your current password").max(200),
    newPassword,
    /** The new password again, to catch a typing slip. */
    confirmPassword: z.string({ required_error: "Repeat the new password" }).max(200),
  })
  .refine((v) => v.newPassword === v.confirmPassword, { path: ["confirmPassword"], message: "The two passwords differ" });
export type ChangePasswordInput = z.infer<typeof changePasswordSchema>;

/** `POST /api/auth/set-password`: from an invitation or reset link. */
export const setPasswordSchema = z
  .object({
    /** The token from the invitation or reset link. */
    token: z.string({ required_error: "The link is incomplete" }).min(20, "The link is incomplete").max(200, "The link is not right"),
    newPassword,
    confirmPassword: z.string({ required_error: "Repeat the new password" }).max(200),
  })
  .refine((v) => v.newPassword === v.confirmPassword, { path: ["confirmPassword"], message: "The two passwords differ" });
export type SetPasswordInput = z.infer<typeof setPasswordSchema>;

/** `POST /api/auth/forgot-password`. */
export const forgotPasswordSchema = z.object({ email });
export type ForgotPasswordInput = z.infer<typeof forgotPasswordSchema>;

const role = z.enum(ROLES, { errorMap: () => ({ message: `Choose one of ${ROLES.join(", ")}` }) });

/** `POST /api/users`: invite a person by e-mail. */
export const inviteUserSchema = z
  .object({
    email,
    /** Shown in the app and in the invitation. */
    name: z.string({ required_error: "Enter a name" }).trim().min(1, "Enter a name").max(120, "is too long"),
    role,
    /** Required for client contacts (and ignored for other roles): the organisation they belong to. */
    clientId: optionalId("must be a positive id"),
  })
  .refine((v) => v.role !== "client" || v.clientId !== undefined, {
    path: ["clientId"],
    message: "A client contact needs a client organisation",
  });
export type InviteUserInput = z.infer<typeof inviteUserSchema>;

/** `PATCH /api/users/{id}`: change role (and organisation), or deactivate / reactivate. */
export const updateUserSchema = z
  .object({
    role: role.optional(),
    /** The organisation of a client contact; required when the role becomes `client`. */
    clientId: z.preprocess((v) => (v === "" ? null : v), id("must be a positive id").nullable().optional()),
    /** false deactivates the account and ends its sessions at once; true reactivates it. */
    active: z.boolean({ invalid_type_error: "must be true or false" }).optional(),
  })
  .strict()
  .refine((v) => v.role !== undefined || v.clientId !== undefined || v.active !== undefined, {
    path: ["body"],
    message: "Say what to change: role, clientId or active",
  });
export type UpdateUserInput = z.infer<typeof updateUserSchema>;

import { z } from "zod";
import { ROLES } from "../permissions";

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
  password: z.string({ required_error: "Enter your password", invalid_type_error: "must be text" }).min(1, "Enter your password").max(200, "is too long"),
});
export type SignInInput = z.infer<typeof signInSchema>;

/** A new password: long enough to resist guessing, short enough to hash cheaply. */
export const newPassword = z
  .string({ required_error: "Choose a password", invalid_type_error: "must be text" })
  .min(12, "Use at least 12 characters")
  .max(200, "Use at most 200 characters");

export const changePasswordSchema = z
  .object({
    currentPassword: z.string().min(1, "Enter your current password").max(200),
    newPassword,
    confirmPassword: z.string().max(200),
  })
  .refine((v) => v.newPassword === v.confirmPassword, { path: ["confirmPassword"], message: "The two passwords differ" });

export const setPasswordSchema = z
  .object({
    /** The token from the invitation or reset link. */
    token: z.string().min(20, "The link is incomplete").max(200),
    newPassword,
    confirmPassword: z.string().max(200),
  })
  .refine((v) => v.newPassword === v.confirmPassword, { path: ["confirmPassword"], message: "The two passwords differ" });

export const forgotPasswordSchema = z.object({ email });

export const inviteUserSchema = z
  .object({
    email,
    name: z.string().trim().min(1, "Enter a name").max(120, "is too long"),
    role: z.enum(ROLES, { errorMap: () => ({ message: `Choose one of ${ROLES.join(", ")}` }) }),
    /** Required for client contacts: the organisation they belong to. */
    clientId: z.coerce.number().int().positive().optional(),
  })
  .refine((v) => v.role !== "client" || v.clientId !== undefined, { path: ["clientId"], message: "A client contact needs a client organisation" });

export const updateUserSchema = z.object({
  role: z.enum(ROLES).optional(),
  clientId: z.coerce.number().int().positive().nullable().optional(),
  active: z.boolean().optional(),
});

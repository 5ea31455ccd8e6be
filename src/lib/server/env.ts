import { z } from "zod";

const port = (name: string) =>
  z.coerce
    .number({ invalid_type_error: `${name} must be a number` })
    .int(`${name} must be a whole number`)
    .min(1, `${name} must be a port number (1–65535)`)
    .max(65535, `${name} must be a port number (1–65535)`);

/** The environment Decant runs in; scripts/ fills it for `npm start` and `npm test`. */
export const envSchema = z.object({
  /** Host of the MariaDB server (the private one on loopback by default). */
  DATABASE_HOST: z.string().min(1).default("127.0.0.1"),
  /** Its TCP port. */
  DATABASE_PORT: port("DATABASE_PORT").default(3307),
  /** Database (schema) name. */
  DATABASE_NAME: z.string().regex(/^[A-Za-z0-9_]+$/, "DATABASE_NAME may hold letters, digits and _ only"),
  /** Application user and its password. */
  DATABASE_USER: z.string().min(1),
  DATABASE_PASSWORD: z.string().min(1),
  /** Public origin of the app, used in links inside e-mails (e.g. https://decant.example.org). */
  APP_ORIGIN: z.string().url("APP_ORIGIN must be a URL such as http://127.0.0.1:4321").optional(),
  /** SMTP relay (the local fake in development and tests). */
  SMTP_HOST: z.string().min(1).default("127.0.0.1"),
  SMTP_PORT: port("SMTP_PORT").default(2525),
  SMTP_SECURE: z
    .enum(["true", "false"])
    .default("false")
    .transform((v) => v === "true"),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  MAIL_FROM: z.string().min(3).default("Decant <decant@facility.test>"),
  /** Folder where the SMTP fake keeps messages; when set, admins get the development inbox. */
  SMTP_FAKE_MAILBOX: z.string().optional(),
  /** Payments API (the local fake unless pointed elsewhere). */
  PAYMENTS_HOST: z.string().min(1).default("127.0.0.1"),
  PAYMENTS_PORT: port("PAYMENTS_PORT").default(12111),
  PAYMENTS_PROTOCOL: z.enum(["http", "https"]).default("http"),
  /** Secret API key (a test key for the fake); invoicing is unavailable without it. */
  PAYMENTS_SECRET_KEY: z
    .string()
    .regex(/^(sk|rk)_\w+$/, "PAYMENTS_SECRET_KEY must look like sk_test_… or sk_live_…")
    .optional(),
  /** Signing secret of the webhook endpoint (whsec_…); webhooks are refused without it. */
  PAYMENTS_WEBHOOK_SECRET: z
    .string()
    .regex(/^whsec_\w+$/, "PAYMENTS_WEBHOOK_SECRET must look like whsec_…")
    .optional(),
  /** Where the payments fake delivers events (the app's /api/webhooks/payments); read by the fake only. */
  PAYMENTS_WEBHOOK_URL: z.string().url("PAYMENTS_WEBHOOK_URL must be a URL").optional(),
  /** Where uploaded files (certificates of analysis, imports) are stored. */
  UPLOAD_DIR: z.string().min(1).default(".data/uploads"),
});

export type Env = z.infer<typeof envSchema>;

export class EnvError extends Error {}

/** Parses an environment; the error names each bad or missing variable. */
export function parseEnv(source: Record<string, string | undefined>): Env {
  const result = envSchema.safeParse(source);
  if (result.success) return result.data;
  const lines = result.error.issues.map((issue) => {
    const name = issue.path.join(".");
    const message =
      issue.message === "Required"
        ? "is missing"
        : issue.message.startsWith(name)
          ? issue.message.slice(name.length).trim()
          : issue.message;
    return `${name} ${message}`;
  });
  throw new EnvError(`Invalid environment: ${lines.join("; ")}`);
}

let cached: Env | undefined;

/** The process environment, parsed once. */
export function getEnv(): Env {
  cached ??= parseEnv(process.env);
  return cached;
}

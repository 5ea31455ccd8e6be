import nodemailer, { type Transporter } from "nodemailer";
import { z } from "zod";
import { getEnv, type Env } from "./env";

export interface OutgoingMail {
  to: string;
  subject: string;
  /** Plain-text body; every message has one. */
  text: string;
  /** HTML body, the same content as the text. */
  html: string;
}

type MailEnv = Pick<Env, "SMTP_HOST" | "SMTP_PORT" | "SMTP_SECURE" | "SMTP_USER" | "SMTP_PASSWORD" | "MAIL_FROM">;

/** A nodemailer transport from the environment: the local fake or a real relay, by configuration only. */
export function createTransport(env: MailEnv): Transporter {
  return nodemailer.createTransport({
    host: env.SMTP_HOST,
    port: env.SMTP_PORT,
    secure: env.SMTP_SECURE,
    ...(env.SMTP_USER ? { auth: { user: env.SMTP_USER, pass: env.SMTP_PASSWORD ?? "" } } : {}),
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
  });
}

let transport: Transporter | undefined;

export async function sendMail(mail: OutgoingMail): Promise<void> {
  const env = getEnv();
  transport ??= createTransport(env);
  await transport.sendMail({ from: env.MAIL_FROM, to: mail.to, subject: mail.subject, text: mail.text, html: mail.html });
}

// HOST and PORT are read by the Node adapter itself; here only to build links when APP_ORIGIN is unset.
const listenAddress = z.object({
  HOST: z.string().min(1).default("127.0.0.1"),
  PORT: z.coerce.number().int().min(1).max(65535).default(4321),
});

/**
 * The origin put into links inside e-mails: APP_ORIGIN when set (it must be, whenever people
 * reach Decant under a name of its own or behind a proxy); otherwise the address the server
 * listens on, which is right for `npm start` and `npm test` on loopback. Never the request's Host
 * header, which a stranger could set to send a victim a link to another site.
 */
export function publicOrigin(): string {
  const configured = getEnv().APP_ORIGIN;
  if (configured) return configured.replace(/\/$/, "");
  const { HOST, PORT } = listenAddress.parse(process.env);
  const host = HOST === "0.0.0.0" || HOST === "::" ? "127.0.0.1" : HOST.includes(":") ? `[${HOST}]` : HOST;
  return `http://${host}:${PORT}`;
}

const HTML_ESCAPES: Record<string, string> = { "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" };
export const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => HTML_ESCAPES[c]!);

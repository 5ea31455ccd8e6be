// The local SMTP fake: a real SMTP server (smtp-server) on loopback that keeps every message it
// receives as a JSON file in SMTP_FAKE_MAILBOX, where tests and the development outbox read it.
// Decant talks to it with nodemailer exactly as it would to a real relay.
import { randomBytes } from "node:crypto";
import { mkdirSync, renameSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { SMTPServer } from "smtp-server";
import { parseMessage } from "./mime";

const port = Number(process.env.FAKE_PORT ?? 2525);
const mailbox = process.env.SMTP_FAKE_MAILBOX;
if (!mailbox) {
  console.error("smtp fake: SMTP_FAKE_MAILBOX is missing (the folder to keep messages in).");
  process.exit(1);
}
mkdirSync(mailbox, { recursive: true });

/** Ids sort by arrival time: 20261201T101500123Z-3f9a1c. */
function newId(now: Date) {
  return `${now.toISOString().replace(/[-:.]/g, "")}-${randomBytes(3).toString("hex")}`;
}

const server = new SMTPServer({
  banner: "Decant SMTP fake: messages are kept, never delivered",
  authOptional: true,
  allowInsecureAuth: true,
  disabledCommands: ["STARTTLS"],
  size: 10 * 1024 * 1024,
  logger: false,
  onAuth(auth, _session, callback) {
    callback(null, { user: auth.username ?? "fake" });
  },
  onData(stream, session, callback) {
    const chunks: Buffer[] = [];
    stream.on("data", (chunk: Buffer) => chunks.push(chunk));
    stream.on("error", callback);
    stream.on("end", () => {
      try {
        const raw = Buffer.concat(chunks);
        const receivedAt = new Date();
        const id = newId(receivedAt);
        const parsed = parseMessage(raw);
        const envelope = {
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : "",
          to: session.envelope.rcptTo.map((r) => r.address),
        };
        const message = { id, receivedAt: receivedAt.toISOString(), envelope, ...parsed, raw: raw.toString("utf8") };
        // Written under a temporary name and renamed, so a reader never sees half a file.
        const temporary = join(mailbox, `.${id}.tmp`);
        writeFileSync(temporary, JSON.stringify(message, null, 2));
        renameSync(temporary, join(mailbox, `${id}.json`));
        callback();
      } catch (error) {
        callback(error instanceof Error ? error : new Error(String(error)));
      }
    });
  },
});

server.on("error", (error) => console.error(`smtp fake: ${error.message}`));
server.listen(port, "127.0.0.1", () => console.log(`smtp fake listening on 127.0.0.1:${port}, keeping mail in ${mailbox}`));

for (const signal of ["SIGINT", "SIGTERM"] as const) {
  process.on(signal, () => server.close(() => process.exit(0)));
}

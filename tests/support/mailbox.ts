// Reads what the SMTP fake (fakes/smtp) kept: the mail a person would have received.
import { isAddressedTo, listMessages, type StoredMessage } from "../../src/lib/server/dev-mailbox";

export type { StoredMessage };

export function mailboxDir(): string {
  const dir = process.env.SMTP_FAKE_MAILBOX;
  if (!dir) throw new Error("SMTP_FAKE_MAILBOX is not set; run the tests through `npm test`, which starts the SMTP fake.");
  return dir;
}

/** Every message to an address, newest first. */
export async function messagesTo(address: string): Promise<StoredMessage[]> {
  return (await listMessages(mailboxDir())).filter((m) => isAddressedTo(m, address));
}

/**
 * Waits until a message to the address arrives (received after `since`, when given, and matching
 * `subject`), and returns the newest such message.
 */
export async function waitForMail(
  address: string,
  options: { since?: Date; subject?: RegExp; timeout_ms?: number } = {},
): Promise<StoredMessage> {
  const deadline = Date.now() + (options.timeout_ms ?? 10_000);
  for (;;) {
    const found = (await messagesTo(address)).find(
      (m) =>
        (!options.since || Date.parse(m.receivedAt) >= options.since.getTime() - 1000) &&
        (!options.subject || options.subject.test(m.subject)),
    );
    if (found) return found;
    if (Date.now() > deadline)
      throw new Error(
        `No mail to ${address}${options.subject ? ` with subject ${options.subject}` : ""} arrived within ${options.timeout_ms ?? 10_000} ms.`,
      );
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

/** The set-password link in a message's plain-text body. */
export function setPasswordLink(message: StoredMessage): URL {
  const match = /https?:\/\/\S+\/set-password\?token=[A-Za-z0-9_%-]+/.exec(message.text);
  if (!match) throw new Error(`No set-password link in "${message.subject}":\n${message.text}`);
  return new URL(match[0]);
}

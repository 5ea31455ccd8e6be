// Reads the messages the local SMTP fake keeps (fakes/smtp): for the development outbox page and tests.
import { readdir, readFile } from "node:fs/promises";
import { join } from "node:path";
import { z } from "zod";

const storedMessage = z.object({
  id: z.string(),
  receivedAt: z.string(),
  envelope: z.object({ from: z.string(), to: z.array(z.string()) }),
  headers: z.record(z.string()),
  from: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  date: z.string().nullable(),
  text: z.string(),
  html: z.string(),
});
export type StoredMessage = z.infer<typeof storedMessage>;

const ID = /^[0-9TZ]+-[0-9a-f]+$/;

async function readOne(dir: string, file: string): Promise<StoredMessage | null> {
  try {
    const parsed = storedMessage.safeParse(JSON.parse(await readFile(join(dir, file), "utf8")));
    return parsed.success ? parsed.data : null;
  } catch {
    return null;
  }
}

/** Every kept message, newest first. */
export async function listMessages(dir: string): Promise<StoredMessage[]> {
  let files: string[];
  try {
    files = (await readdir(dir)).filter((f) => f.endsWith(".json") && !f.startsWith("."));
  } catch {
    return [];
  }
  const messages = await Promise.all(
    files
      .sort()
      .reverse()
      .map((f) => readOne(dir, f)),
  );
  return messages.filter((m): m is StoredMessage => m !== null);
}

/** One message by id, or null (also for ids that are not of the fake's form). */
export async function readMessage(dir: string, id: string): Promise<StoredMessage | null> {
  if (!ID.test(id)) return null;
  return readOne(dir, `${id}.json`);
}

/** True when the message was sent to the address (envelope or To header). */
export function isAddressedTo(message: StoredMessage, address: string): boolean {
  const wanted = address.toLowerCase();
  return message.envelope.to.some((a) => a.toLowerCase() === wanted) || message.to.some((a) => a.toLowerCase().includes(wanted));
}

// The SMTP fake's MIME reader, fed messages exactly as nodemailer composes them.
import MailComposer from "nodemailer/lib/mail-composer";
import { describe, expect, it } from "vitest";
import { decodeHeader, parseMessage } from "../../fakes/smtp/mime";

async function compose(options: ConstructorParameters<typeof MailComposer>[0]): Promise<Buffer> {
  return new MailComposer(options).compile().build();
}

describe("parseMessage", () => {
  it.each([
    // Plain ASCII: nodemailer sends 7bit.
    ["ascii", "Your link", "Open http://127.0.0.1:4321/set-password?token=abc_DEF-123 now.", '<p>Open the <a href="x">link</a>.</p>'],
    // Non-ASCII text: quoted-printable; long lines get soft line breaks.
    ["accents and a long line", "Einladung für Zoë", `Hallo Zoë, ${"lange Zeile ".repeat(20)}Ende.`, "<p>Grüße — Ångström</p>"],
    // Mostly non-Latin text: nodemailer picks base64.
    ["base64", "試薬のロット", "試薬のロット番号は 4711 です。".repeat(5), "<p>緩衝液 pH 3.0</p>"],
  ])("reads subject, text and HTML back (%s)", async (_case, subject, text, html) => {
    const raw = await compose({ from: "Decant <decant@facility.test>", to: "person@lab.test", subject, text, html });
    const parsed = parseMessage(raw);
    expect(parsed.subject).toBe(subject);
    expect(parsed.text.replace(/\r\n/g, "\n")).toBe(text);
    expect(parsed.html.replace(/\r\n/g, "\n")).toBe(html);
    expect(parsed.from).toBe("Decant <decant@facility.test>");
    expect(parsed.to).toEqual(["person@lab.test"]);
    expect(parsed.date).not.toBeNull();
  });

  it("skips attachments and keeps the first text part", async () => {
    const raw = await compose({
      from: "a@lab.test",
      to: "b@lab.test",
      subject: "With file",
      text: "Body text",
      attachments: [{ filename: "notes.txt", content: "not the body" }],
    });
    expect(parseMessage(raw).text).toBe("Body text");
  });
});

describe("decodeHeader", () => {
  it.each([
    ["=?UTF-8?Q?Gr=C3=BC=C3=9Fe?=", "Grüße"],
    ["=?UTF-8?B?w4VuZ3N0csO2bQ==?=", "Ångström"],
    // Adjacent encoded words join without the whitespace between them (RFC 2047 §6.2).
    ["=?UTF-8?Q?a?= =?UTF-8?Q?b?=", "ab"],
    ["plain words stay", "plain words stay"],
  ])("%s → %s", (input, expected) => {
    expect(decodeHeader(input)).toBe(expected);
  });
});

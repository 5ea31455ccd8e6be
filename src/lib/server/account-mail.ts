// The e-mails Decant sends about accounts: each with a plain-text and an HTML body.
import type { OutgoingMail } from "./mail";
import { escapeHtml } from "./mail";
import { ROLE_LABELS, type Role } from "../permissions";

const FOOTER_TEXT = "This link works once and expires after 48 hours. If you did not expect this message, you can ignore it.";

function html(paragraphs: string[], link: string, button: string): string {
  return `<!doctype html><html lang="en"><body style="font-family:'IBM Plex Sans',Arial,sans-serif;color:#1c2733;background:#f6f4ef;padding:24px">
<div style="max-width:520px;margin:0 auto;background:#ffffff;border:1px solid #dcd8cf;border-radius:8px;padding:24px">
<p style="font-weight:600;font-size:18px;margin:0 0 16px">Decant</p>
${paragraphs.map((p) => `<p style="margin:0 0 12px;line-height:1.5">${p}</p>`).join("\n")}
<p style="margin:20px 0"><a href="${escapeHtml(link)}" style="background:#145f66;color:#ffffff;padding:10px 16px;border-radius:6px;text-decoration:none;font-weight:500">${escapeHtml(button)}</a></p>
<p style="margin:0 0 12px;font-size:13px;color:#5f6b77;word-break:break-all">Or paste this address into your browser: ${escapeHtml(link)}</p>
<p style="margin:0;font-size:13px;color:#5f6b77">${escapeHtml(FOOTER_TEXT)}</p>
</div></body></html>`;
}

export function invitationMail(input: { to: string; name: string; role: Role; invitedBy: string; link: string }): OutgoingMail {
  const role = ROLE_LABELS[input.role];
  return {
    to: input.to,
    subject: "You are invited to Decant",
    text: [
      `Hello ${input.name},`,
      "",
      `${input.invitedBy} has invited you to Decant, the facility's mobile-phase and solvent ledger, as ${role}.`,
      "Choose your password here:",
      "",
      input.link,
      "",
      FOOTER_TEXT,
    ].join("\n"),
    html: html(
      [
        `Hello ${escapeHtml(input.name)},`,
        `${escapeHtml(input.invitedBy)} has invited you to Decant, the facility's mobile-phase and solvent ledger, as <strong>${escapeHtml(role)}</strong>.`,
      ],
      input.link,
      "Choose your password",
    ),
  };
}

export function resetMail(input: { to: string; name: string; link: string }): OutgoingMail {
  return {
    to: input.to,
    subject: "Set a new Decant password",
    text: [
      `Hello ${input.name},`,
      "",
      "Someone (probably you) asked to set a new password for your Decant account. Choose it here:",
      "",
      input.link,
      "",
      FOOTER_TEXT,
    ].join("\n"),
    html: html(
      [`Hello ${escapeHtml(input.name)},`, "Someone (probably you) asked to set a new password for your Decant account."],
      input.link,
      "Choose a new password",
    ),
  };
}

/**
 * One mail per account lock, to the owner and to each administrator: new browsers are refused
 * until `until`; browsers the owner signed in on before still work.
 */
export function accountLockedMail(input: {
  to: string;
  name: string;
  accountEmail: string;
  forOwner: boolean;
  failures: number;
  until: string;
  link: string;
}): OutgoingMail {
  const who = input.forOwner ? "your Decant account" : `the Decant account ${input.accountEmail}`;
  const lines = [
    `Hello ${input.name},`,
    "",
    `There were ${input.failures} wrong passwords for ${who} within the hour, so Decant refuses sign-ins to it from new browsers until ${input.until}.`,
    input.forOwner
      ? "A browser you have signed in on before still lets you in. If the wrong passwords were not yours, choose a new password and consider turning on two-factor sign-in on My account."
      : "Browsers the owner has signed in on before still work. If this looks like an attack, check the addresses in the audit log and ask the owner to turn on two-factor sign-in.",
  ];
  return {
    to: input.to,
    subject: input.forOwner ? "Sign-in to your Decant account is paused for new browsers" : `Sign-in paused for ${input.accountEmail}`,
    text: [...lines, "", input.link].join("\n"),
    html: html(lines.filter(Boolean).map(escapeHtml), input.link, input.forOwner ? "Open Decant" : "Open the people page").replace(
      escapeHtml(FOOTER_TEXT),
      "You get this message once for each pause, not for every attempt.",
    ),
  };
}

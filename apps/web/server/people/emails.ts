import type { RenderedEmail } from '../mail/templates';

const escapeHtml = (value: string) =>
  value.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!,
  );

const whenUtc = (d: Date) => `${d.toISOString().slice(0, 16).replace('T', ' ')} UTC`;

/** The invitation a new person gets: who asked them, what for, and the link to set a password. */
export function invitationEmail(input: {
  name: string;
  invitedBy: string;
  roleLabel: string;
  worksAt: string;
  link: string;
  expiresAt: Date;
}): RenderedEmail {
  const subject = `${input.invitedBy} invited you to Reelwright`;
  const lines = [
    `Hello ${input.name},`,
    '',
    `${input.invitedBy} has added you to Reelwright as ${input.roleLabel} (${input.worksAt}).`,
    'Choose your password from this link to sign in for the first time:',
    '',
    input.link,
    '',
    `The link works once, until ${whenUtc(input.expiresAt)}. If you did not expect it, ignore this message.`,
  ];
  const e = escapeHtml;
  const html = [
    `<p>Hello ${e(input.name)},</p>`,
    `<p>${e(input.invitedBy)} has added you to Reelwright as ${e(input.roleLabel)} (${e(input.worksAt)}).</p>`,
    `<p><a href="${e(input.link)}">Choose your password</a> to sign in for the first time.</p>`,
    `<p>The link works once, until ${e(whenUtc(input.expiresAt))}. If you did not expect it, ignore this message.</p>`,
  ].join('\n');
  return { subject, text: lines.join('\n'), html };
}

/** A password reset someone asked for on the sign-in page. */
export function passwordResetEmail(input: {
  name: string;
  link: string;
  expiresAt: Date;
}): RenderedEmail {
  const subject = 'Set a new Reelwright password';
  const lines = [
    `Hello ${input.name},`,
    '',
    'Someone asked to set a new password for your Reelwright account. To choose one, open:',
    '',
    input.link,
    '',
    `The link works once, until ${whenUtc(input.expiresAt)}. If it was not you, ignore this message: your password stays as it is.`,
  ];
  const e = escapeHtml;
  const html = [
    `<p>Hello ${e(input.name)},</p>`,
    `<p>Someone asked to set a new password for your Reelwright account. <a href="${e(input.link)}">Choose a new password</a>.</p>`,
    `<p>The link works once, until ${e(whenUtc(input.expiresAt))}. If it was not you, ignore this message: your password stays as it is.</p>`,
  ].join('\n');
  return { subject, text: lines.join('\n'), html };
}

import { escapeHtml, mailPage, mailParagraphs } from './frame.js';
import type { MailMessage } from './mail-queue.js';

function page(paragraphs: string[], link: { href: string; label: string }): string {
  const esc = escapeHtml;
  return mailPage(
    `${mailParagraphs(paragraphs)}<p style="margin:0 0 14px"><a href="${esc(link.href)}" style="color:#1b4d8f">${esc(link.label)}</a></p><p style="margin:0;color:#4a5565;font-size:14px">If the link does not open, copy this address into your browser:<br>${esc(link.href)}</p>`,
  );
}

export function invitationMail(p: { to: string; name: string; workshopName: string; inviterName: string; link: string; days: number }): MailMessage {
  const lines = [
    `Hello ${p.name},`,
    `${p.inviterName} has invited you to sign in to Wingstage for ${p.workshopName}.`,
    `Choose your password with the link below. It works once and for ${p.days} days.`,
  ];
  return {
    to: p.to,
    subject: `Your Wingstage sign-in for ${p.workshopName}`,
    text: `${lines.join('\n\n')}\n\n${p.link}\n\nIf you were not expecting this, you can ignore this e-mail.\n`,
    html: page([...lines], { href: p.link, label: 'Set your password' }),
  };
}

export function passwordResetMail(p: { to: string; name: string; link: string; minutes: number }): MailMessage {
  const lines = [
    `Hello ${p.name},`,
    `Someone asked to reset the password of your Wingstage sign-in. If it was you, choose a new password with the link below. It works once and for ${p.minutes} minutes.`,
    'If it was not you, ignore this e-mail: your password stays as it is.',
  ];
  return {
    to: p.to,
    subject: 'Reset your Wingstage password',
    text: `${lines.join('\n\n')}\n\n${p.link}\n`,
    html: page(lines, { href: p.link, label: 'Choose a new password' }),
  };
}

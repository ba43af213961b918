import type { MailMessage } from './mail-queue.js';

/** Text made safe inside HTML (element content and quoted attribute values). */
export const escapeHtml = (s: string): string => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

/** The body every Wingstage e-mail sits in: one plain column of readable type. */
export function mailPage(inner: string): string {
  return `<!doctype html><html><body style="font-family:sans-serif;font-size:16px;line-height:1.5;color:#1d2430">${inner}</body></html>`;
}

export const mailParagraphs = (paragraphs: string[]): string => paragraphs.map((p) => `<p style="margin:0 0 14px">${escapeHtml(p)}</p>`).join('');

/**
 * An e-mail of plain paragraphs, with at most one link (its address also written out, for a mail
 * program that will not open it) and any attachments: the same words in the text and HTML parts.
 */
export function framedMail(
  to: string,
  subject: string,
  paragraphs: string[],
  { link = null, attachments }: { link?: { href: string; label: string } | null; attachments?: MailMessage['attachments'] } = {},
): MailMessage {
  const linkHtml = link
    ? `<p style="margin:0 0 14px"><a href="${escapeHtml(link.href)}" style="color:#1b4d8f">${escapeHtml(link.label)}</a></p><p style="margin:0;color:#4a5565;font-size:14px">If the link does not open, copy this address into your browser:</p><p style="margin:0;color:#4a5565;font-size:14px"><span style="word-break:break-all;overflow-wrap:anywhere">${escapeHtml(link.href)}</span></p>`
    : '';
  return {
    to,
    subject,
    text: `${paragraphs.join('\n\n')}${link ? `\n\n${link.label}: ${link.href}` : ''}\n`,
    html: mailPage(`${mailParagraphs(paragraphs)}${linkHtml}`),
    ...(attachments ? { attachments } : {}),
  };
}

// The two link e-mails: an invitation to set a first password, and a password reset. Plain text and HTML.
import { escapeHtml, type Mail } from '../lib/mailer.js';

interface LinkMail {
  to: string;
  name: string;
  organizationName: string;
  link: string;
  expiresAt: Date;
}

const when = (d: Date) => d.toISOString().replace('T', ' ').slice(0, 16) + ' UTC';

function html(paragraphs: string[], link: string, button: string): string {
  const ps = paragraphs.map((p) => `<p style="margin:0 0 12px">${escapeHtml(p)}</p>`).join('');
  return `<!doctype html><html><body style="font-family:'Source Sans 3',Arial,sans-serif;color:#1f2933;line-height:1.5">
${ps}<p style="margin:20px 0"><a href="${escapeHtml(link)}" style="background:#0f5f73;color:#fff;padding:10px 18px;border-radius:6px;text-decoration:none">${escapeHtml(button)}</a></p>
<p style="margin:0 0 12px;font-size:13px;color:#52606d">If the button does not work, open this address: ${escapeHtml(link)}</p>
</body></html>`;
}

export function invitationMail(m: LinkMail): Mail {
  const lines = [
    `Hello ${m.name},`,
    `${m.organizationName} has given you a Beadroll sign-in for its welder qualification records.`,
    `Choose your password with the link below. It works once and until ${when(m.expiresAt)}.`,
  ];
  return {
    to: m.to,
    subject: `Your Beadroll sign-in for ${m.organizationName}`,
    text: `${lines.join('\n\n')}\n\n${m.link}\n\nIf you did not expect this message, ignore it.\n`,
    html: html([...lines, 'If you did not expect this message, ignore it.'], m.link, 'Choose my password'),
  };
}

export function passwordResetMail(m: LinkMail): Mail {
  const lines = [
    `Hello ${m.name},`,
    `Someone asked to reset the password of your Beadroll sign-in (${m.to}).`,
    `Choose a new password with the link below. It works once and until ${when(m.expiresAt)}.`,
  ];
  return {
    to: m.to,
    subject: 'Reset your Beadroll password',
    text: `${lines.join('\n\n')}\n\n${m.link}\n\nIf you did not ask for this, ignore this message; your password stays as it is.\n`,
    html: html(
      [...lines, 'If you did not ask for this, ignore this message; your password stays as it is.'],
      m.link,
      'Choose a new password',
    ),
  };
}

// Outgoing e-mail through SMTP (nodemailer). In development and tests the SMTP server is the local mail
// catcher; in production a hosted relay — only the configuration differs.
import { createTransport } from 'nodemailer';
import type { Config } from '../config.js';

export interface Mail {
  to: string;
  subject: string;
  text: string;
  html: string;
}

export interface Mailer {
  /** Resolves once the SMTP server has accepted the message, with the Message-ID it was sent under. */
  send(mail: Mail): Promise<{ messageId: string }>;
  close(): void;
}

const loopback = new Set(['127.0.0.1', 'localhost', '::1']);

export function createMailer(smtp: Config['smtp']): Mailer {
  const transport = createTransport({
    host: smtp.host,
    port: smtp.port,
    secure: smtp.secure,
    // The loopback catcher speaks plain SMTP (its bundled STARTTLS certificate has expired); a relay
    // elsewhere must offer STARTTLS.
    ignoreTLS: !smtp.secure && loopback.has(smtp.host),
    requireTLS: !smtp.secure && !loopback.has(smtp.host),
    ...(smtp.user ? { auth: { user: smtp.user, pass: smtp.password ?? '' } } : {}),
    connectionTimeout: 5000,
    greetingTimeout: 5000,
    socketTimeout: 10000,
  });
  return {
    async send(mail) {
      const info = await transport.sendMail({
        from: smtp.from,
        to: mail.to,
        subject: mail.subject,
        text: mail.text,
        html: mail.html,
      });
      return { messageId: String(info.messageId ?? '') };
    },
    close() {
      transport.close();
    },
  };
}

/** Escapes text for an HTML e-mail body. */
export function escapeHtml(s: string): string {
  return s.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] ?? c,
  );
}

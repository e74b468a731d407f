import { describe, expect, it } from 'vitest';
import { invitationMail, passwordResetMail } from './auth.mail.js';

const base = {
  to: 'nell@example.test',
  name: 'Nell <b>Bold</b>',
  organizationName: 'Harrow & Sons',
  link: 'http://127.0.0.1:8080/set-password?token=abc&x=1',
  expiresAt: new Date('2026-03-01T10:00:00Z'),
};

describe('link e-mails', () => {
  it('carry the link and the expiry in plain text and HTML, escaping names in HTML', () => {
    const mail = invitationMail(base);
    expect(mail.subject).toBe('Your Beadroll sign-in for Harrow & Sons');
    expect(mail.text).toContain(base.link);
    expect(mail.text).toContain('2026-03-01 10:00 UTC');
    expect(mail.html).toContain('Nell &lt;b&gt;Bold&lt;/b&gt;');
    expect(mail.html).toContain('href="http://127.0.0.1:8080/set-password?token=abc&amp;x=1"');
    expect(mail.html).not.toContain('<b>Bold</b>');
  });

  it('words the reset differently from the invitation', () => {
    const mail = passwordResetMail(base);
    expect(mail.subject).toBe('Reset your Beadroll password');
    expect(mail.text).toContain('your password stays as it is');
  });
});

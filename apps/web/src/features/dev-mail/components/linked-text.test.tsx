import { render, screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { LinkedText, splitLinks } from './linked-text';

describe('LinkedText', () => {
  it('turns the set-password address in an e-mail into a link, leaving the full stop outside', () => {
    const link = 'http://127.0.0.1:8080/set-password?token=abc_DEF-123';
    expect(splitLinks(`Open ${link}.`)).toEqual([{ text: 'Open ' }, { text: link, href: link }, { text: '.' }]);
    render(<LinkedText text={`Welcome.\nOpen ${link}.`} />);
    expect(screen.getByRole('link', { name: link }).getAttribute('href')).toBe(link);
  });
});

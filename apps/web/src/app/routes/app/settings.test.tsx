// Settings (issue 10, item 11): "Settings saved." belongs to the save that succeeded; it goes away as
// soon as a later attempt is refused, so it never stands beside a validation error.
import type { CompanySettings } from '@beadroll/rules';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { render, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { SettingsForm } from './settings';

const settings: CompanySettings = {
  warnDays: [30, 7],
  closedMonthAfter: 2,
  lapseWatchTime: '06:00',
  timeZone: 'Europe/London',
  timeZoneIsServerDefault: false,
  serverTimeZone: 'UTC',
  today: '2026-12-02',
  updatedAt: '2026-12-01T10:00:00.000Z',
};

afterEach(() => vi.unstubAllGlobals());

describe('the settings form', () => {
  it('drops "Settings saved." when a later attempt is refused for a bad field', async () => {
    const fetch = vi.fn(() =>
      Promise.resolve(
        new Response(JSON.stringify({ ...settings, warnDays: [21, 7] }), {
          status: 200,
          headers: { 'Content-Type': 'application/json' },
        }),
      ),
    );
    vi.stubGlobal('fetch', fetch);
    const client = new QueryClient({ defaultOptions: { mutations: { retry: false } } });
    render(
      <QueryClientProvider client={client}>
        <SettingsForm settings={settings} />
      </QueryClientProvider>,
    );
    const days = screen.getByLabelText(/Warn before a lapse/);
    await userEvent.clear(days);
    await userEvent.type(days, '21, 7');
    await userEvent.click(screen.getByRole('button', { name: 'Save settings' }));
    await waitFor(() => expect(screen.queryByText('Settings saved.')).toBeTruthy());
    expect(fetch).toHaveBeenCalledTimes(1);

    await userEvent.clear(days);
    await userEvent.type(days, 'soon');
    await userEvent.click(screen.getByRole('button', { name: 'Save settings' }));
    expect(screen.queryByText('Settings saved.')).toBeNull();
    expect(fetch).toHaveBeenCalledTimes(1);
  });
});

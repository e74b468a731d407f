// The lapsed-use review (issue 10, item 2): the QA manager cannot close a review without a decision about
// the welds and a note; a complete review posts both. Clicked in the rendered dialog; fetch is the
// browser's, answered here as the API answers.
import type { ReviewEntry } from '@beadroll/rules';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { render, screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { ReviewDialog } from './review-list';

const entry: ReviewEntry = {
  id: '3f2b8c1d-5e6a-4b7c-8d9e-0a1b2c3d4e5f',
  welder: { id: '7b0c7f3e-2b7a-4d37-9b8e-2a4f1e0c9d11', stamp: 'HP-14', name: 'Ada Reyes' },
  shop: { id: '0f3c9a52-6f1e-4b0a-8d55-3c1e2f9a7b10', name: 'North bay', code: 'NB' },
  process: 'SMAW',
  usedOn: '2026-11-12',
  jobReference: 'J-9',
  note: '',
  reviewStatus: 'pending',
  reviewNote: null,
  reviewDecision: null,
  loggedBy: 'Pat Foreman',
};

function renderDialog(onClose = vi.fn()) {
  const client = new QueryClient({ defaultOptions: { mutations: { retry: false } } });
  render(
    <QueryClientProvider client={client}>
      <ReviewDialog entry={entry} onClose={onClose} />
    </QueryClientProvider>,
  );
  return onClose;
}

afterEach(() => vi.unstubAllGlobals());

describe('the lapsed-use review', () => {
  it('refuses to close without a decision and a note, and sends nothing (common practice (no source): a nonconformance is closed with a disposition)', async () => {
    const fetch = vi.fn();
    vi.stubGlobal('fetch', fetch);
    const onClose = renderDialog();
    await userEvent.click(screen.getByRole('button', { name: 'Mark reviewed' }));
    expect(screen.getByText('Choose what was decided about the welds')).toBeTruthy();
    expect(screen.getByText(/Note what was done and where it is recorded/)).toBeTruthy();
    expect(fetch).not.toHaveBeenCalled();
    // A decision alone is not enough either: the note stays required.
    await userEvent.click(screen.getByRole('radio', { name: 'Welds cut out or repaired' }));
    await userEvent.type(screen.getByLabelText(/Disposition note/), '   ');
    await userEvent.click(screen.getByRole('button', { name: 'Mark reviewed' }));
    expect(fetch).not.toHaveBeenCalled();
    expect(onClose).not.toHaveBeenCalled();
  });

  it('posts the decision and the note, then closes', async () => {
    const fetch = vi.fn(() =>
      Promise.resolve(
        new Response(JSON.stringify({ id: entry.id, reviewStatus: 'reviewed', reviewDecision: 'welds-repaired', reviewNote: 'x' }), {
          status: 200,
          headers: { 'Content-Type': 'application/json' },
        }),
      ),
    );
    vi.stubGlobal('fetch', fetch);
    const onClose = renderDialog();
    await userEvent.click(screen.getByRole('radio', { name: 'Welds cut out or repaired' }));
    await userEvent.type(screen.getByLabelText(/Disposition note/), 'Two welds on J-9 cut out, NCR-031');
    await userEvent.click(screen.getByRole('button', { name: 'Mark reviewed' }));
    await vi.waitFor(() => expect(onClose).toHaveBeenCalled());
    const [url, init] = fetch.mock.calls[0] as unknown as [string, RequestInit];
    expect(url).toContain(`/api/continuity/entries/${entry.id}/review`);
    expect(JSON.parse(init.body as string)).toEqual({ decision: 'welds-repaired', note: 'Two welds on J-9 cut out, NCR-031' });
  });
});

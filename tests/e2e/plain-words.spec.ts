// The welder's pages and the public Verify page speak the trade's words: no internal ids (asme-ix,
// shop-general), no raw validation wording ("Not a valid id", "Choose one of asme-ix…"), no source tags
// of the rules ("from memory", "read second-hand", "common practice (no source)") — those are for the QA
// manager's details view. Dates read one way: ISO in tables, the long form in prose.
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, newSession, pageErrors } from '../support/browser.js';
import { demo, signIn, signOut } from '../support/e2e-demo.js';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const DEVELOPER_WORDS: [string, RegExp][] = [
  ['an internal code id', /\b(asme-ix|aws-d1\.1|api-1104|iso-9606-1|shop-general|beadroll-default)\b/],
  ['a criteria id label', /Criteria set:/i],
  ['a raw validation message', /Not a valid id|Choose one of|Invalid (input|option)|expected (string|number)/i],
  ['a source tag', /from memory|second-hand|no source|common practice|from-memory|common-practice/i],
  ['a record id', /\b[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}\b/i],
  ['a machine timestamp', /\d{4}-\d{2}-\d{2}T\d{2}:\d{2}/],
];

/** The words a person reads on the page, including what opens in <details>, with the hidden parts left out. */
async function visibleWords(page: Page): Promise<string> {
  await page.evaluate(() => document.querySelectorAll('details').forEach((d) => d.setAttribute('open', '')));
  return page.locator('body').innerText();
}

function developerWordsIn(text: string): string[] {
  return DEVELOPER_WORDS.flatMap(([what, pattern]) => {
    const m = pattern.exec(text);
    return m ? [`${what}: "${text.slice(Math.max(0, m.index - 40), m.index + m[0].length + 40).replace(/\s+/g, ' ')}"`] : [];
  });
}

async function settled(page: Page): Promise<void> {
  await page.waitForLoadState('networkidle');
  await page.getByText(/Loading|Checking/).first().waitFor({ state: 'detached', timeout: 15_000 }).catch(() => undefined);
}

describe('plain words on the welder’s and public pages', () => {
  let welderId = '';
  let verifyUrl: string | null = null;

  it('finds the demo welder and the live verify link (the QA manager’s view)', async () => {
    const qa = await newSession(browser);
    await signIn(qa.page, demo.qa.email);
    welderId = await qa.page.evaluate(async (stamp) => {
      const res = await fetch(`/api/welders?q=${encodeURIComponent(stamp)}`);
      const body = (await res.json()) as { items: { id: string; stamp: string }[] };
      return body.items.find((w) => w.stamp === stamp)?.id ?? '';
    }, demo.welder.stamp);
    expect(welderId).not.toBe('');
    verifyUrl = await qa.page.evaluate(async (id) => {
      const res = await fetch(`/api/welders/${id}/verify-token`);
      return ((await res.json()) as { url: string | null }).url;
    }, welderId);
    await signOut(qa.page);
    await qa.context.close();
  });

  it('the welder’s own pages show no developer words, and prose dates read "14 March 2026"', async () => {
    expect(welderId).not.toBe('');
    const { page, context } = await newSession(browser);
    await signIn(page, demo.welder.email);
    const found: string[] = [];
    for (const path of ['/my-qualifications', `/welders/${welderId}`, '/welders/not-a-welder']) {
      await page.goto(path);
      await settled(page);
      found.push(...developerWordsIn(await visibleWords(page)).map((f) => `${path}: ${f}`));
    }
    await page.goto('/my-qualifications');
    await page.getByRole('article').first().waitFor();
    const article = await page.getByRole('article').first().innerText();
    expect(article).toMatch(/\d{1,2} (January|February|March|April|May|June|July|August|September|October|November|December) \d{4}/);
    expect(found).toEqual([]);
    expect(pageErrors(page)).toEqual([]);
    await context.close();
  });

  it('the public verify page, for a live link and for an unknown one, shows no developer words', async () => {
    const found: string[] = [];
    const inspector = await newSession(browser);
    if (verifyUrl) {
      await inspector.page.goto(new URL(verifyUrl).pathname);
      await inspector.page.getByRole('heading', { level: 1 }).waitFor();
      await settled(inspector.page);
      found.push(...developerWordsIn(await visibleWords(inspector.page)).map((f) => `verify: ${f}`));
    }
    await inspector.page.goto(`/verify/${'A'.repeat(43)}`);
    await settled(inspector.page);
    found.push(...developerWordsIn(await visibleWords(inspector.page)).map((f) => `unknown verify: ${f}`));
    await inspector.context.close();
    expect(found).toEqual([]);
  });
});

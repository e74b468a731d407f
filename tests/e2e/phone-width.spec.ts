// On a phone (390 px wide) the welder file never scrolls sideways as a page: wide tables scroll inside
// their own frame. On a tablet (768 px) the foreman's continuity log fits the same way.
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, newSession, pageErrors } from '../support/browser.js';
import { demo, signIn } from '../support/e2e-demo.js';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

/** Elements that stick out past the right edge of the page and are not inside a scrolling frame. */
async function overflow(page: Page): Promise<{ pageScrolls: boolean; sticking: string[] }> {
  await page.waitForLoadState('networkidle');
  return page.evaluate(() => {
    const width = document.documentElement.clientWidth;
    const sticking: string[] = [];
    for (const el of Array.from(document.querySelectorAll('body *'))) {
      const box = el.getBoundingClientRect();
      if (box.width === 0 || box.right <= width + 1) continue;
      let framed = false;
      for (let a = el.parentElement; a && !framed; a = a.parentElement) framed = ['auto', 'scroll', 'hidden'].includes(getComputedStyle(a).overflowX);
      if (!framed) sticking.push(`${el.tagName.toLowerCase()} "${(el.textContent ?? '').trim().slice(0, 40)}" ends at ${Math.round(box.right)} px`);
    }
    return { pageScrolls: document.documentElement.scrollWidth > width, sticking: sticking.slice(0, 5) };
  });
}

async function demoWelderId(page: Page): Promise<string> {
  return page.evaluate(async (stamp) => {
    const res = await fetch(`/api/welders?q=${encodeURIComponent(stamp)}`);
    return ((await res.json()) as { items: { id: string; stamp: string }[] }).items.find((w) => w.stamp === stamp)?.id ?? '';
  }, demo.welder.stamp);
}

describe('narrow screens', () => {
  it('the welder’s own file and qualifications fit a 390 px phone', async () => {
    const { page, context } = await newSession(browser, { width: 390, height: 844 });
    await signIn(page, demo.welder.email);
    const id = await demoWelderId(page);
    for (const path of ['/my-qualifications', `/welders/${id}`]) {
      await page.goto(path);
      await page.getByRole('heading', { level: 1 }).first().waitFor();
      expect(await overflow(page), path).toEqual({ pageScrolls: false, sticking: [] });
    }
    expect(pageErrors(page)).toEqual([]);
    await context.close();
  });

  it('the QA manager’s view of a welder file fits a 390 px phone', async () => {
    const { page, context } = await newSession(browser, { width: 390, height: 844 });
    await signIn(page, demo.qa.email);
    await page.goto(`/welders/${await demoWelderId(page)}`);
    await page.getByRole('heading', { name: 'Qualifications' }).waitFor();
    expect(await overflow(page)).toEqual({ pageScrolls: false, sticking: [] });
    await context.close();
  });

  it('the foreman’s continuity log fits a 768 px tablet', async () => {
    const { page, context } = await newSession(browser, { width: 768, height: 1024 });
    await signIn(page, demo.foreman.email);
    await page.goto('/continuity');
    await page.getByRole('heading', { level: 1 }).first().waitFor();
    expect(await overflow(page)).toEqual({ pageScrolls: false, sticking: [] });
    await context.close();
  });
});

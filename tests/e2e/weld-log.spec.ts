// Journey of issue 12: on a tablet-sized screen the foreman logs a job's welds — the second row copied from
// the first, one weld on a wall thicker than the welder's qualification allows — and sees that one flagged
// with its clause before and after saving; the QA manager finds it in the review queue, records a
// disposition, and prints the weld page.
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, newSession, pageErrors, type Session } from '../support/browser.js';
import { demo, signIn } from '../support/e2e-demo.js';

let browser: Browser;
const runId = Date.now().toString(36).toUpperCase();
const job = `E2E-${runId}`;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

interface DemoWeld {
  shop: { id: string };
  passes: { welder: { stamp: string }; process: string }[];
  joint: { thickness: { value: number; unit: string }; outsideDiameter?: { value: number; unit: string }; fNumber?: number; backing: boolean };
}

async function getJson<T>(page: Page, url: string): Promise<T> {
  const res = await page.request.get(url);
  expect(res.status(), url).toBe(200);
  return (await res.json()) as T;
}

describe('the weld log', () => {
  let foreman: Session;
  let qa: Session;
  let sample: DemoWeld;

  beforeAll(async () => {
    foreman = await newSession(browser, { width: 1024, height: 768 });
    await signIn(foreman.page, demo.foreman.email);
    // The demo job HPF-2433: a welder in force for SMAW pipe and a joint inside their ranges.
    const demoJob = await getJson<{ items: (DemoWeld & { flagged: boolean })[] }>(foreman.page, '/api/welds?job=HPF-2433');
    sample = demoJob.items.find((w) => !w.flagged)!;
    expect(sample).toBeTruthy();
  });
  afterAll(async () => {
    await foreman?.context.close();
    await qa?.context.close();
  });

  it('the foreman logs two welds of a job on a tablet; the one outside the qualification is flagged with its clause', async () => {
    const { page } = foreman;
    const errors = pageErrors(page);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Weld log' }).click();
    await page.getByRole('heading', { name: 'Weld log' }).waitFor();
    await page.getByText('Choose a job').waitFor();
    await page.getByLabel('Shop', { exact: true }).selectOption(sample.shop.id);
    await page.getByLabel('Job or traveler').fill(job);
    await page.getByRole('button', { name: 'Open job' }).click();
    await page.getByText('No welds logged on this job yet').waitFor();

    const stamp = sample.passes[0]!.welder.stamp;
    const row1 = page.getByRole('row', { name: 'Row 1' });
    await row1.getByLabel('Weld number').fill('1');
    await row1.getByLabel('Stamp', { exact: true }).fill(stamp);
    await row1.getByLabel('Process', { exact: true }).selectOption(sample.passes[0]!.process);
    await row1.getByLabel('Plate or pipe').selectOption('pipe');
    await row1.getByLabel('Position').selectOption('F');
    await row1.getByLabel('Thickness').fill(`${sample.joint.thickness.value} ${sample.joint.thickness.unit}`);
    await row1.getByLabel('Pipe OD').fill(`${sample.joint.outsideDiameter!.value} ${sample.joint.outsideDiameter!.unit}`);
    if (sample.joint.fNumber) await row1.getByLabel('F-No.').fill(String(sample.joint.fNumber));
    await row1.getByLabel('Backing').selectOption(sample.joint.backing ? 'with' : 'without');
    // Checked live against the welder's qualification as it is typed.
    await row1.getByText(new RegExp(`${stamp} ${sample.passes[0]!.process}: within WPQ-`)).waitFor();

    // The next row copies the date, welder and joint of the one above and counts the weld number on.
    await page.getByRole('button', { name: 'Add a row' }).click();
    const row2 = page.getByRole('row', { name: 'Row 2' });
    expect(await row2.getByLabel('Weld number').inputValue()).toBe('2');
    expect(await row2.getByLabel('Stamp', { exact: true }).inputValue()).toBe(stamp);
    await row2.getByLabel('Thickness').fill('1 in');
    await row2.getByText(/will be flagged/).waitFor();
    await row2.getByText(/QW-452\.1/).first().waitFor();

    await page.getByRole('button', { name: 'Save welds' }).click();
    await page.getByText('2 of 2 saved').waitFor();
    await row1.getByText('Within qualification').waitFor();
    await row2.getByText('Flagged · waiting for a disposition').waitFor();
    // The job's list shows both, each with its check.
    const logged = page.getByRole('table', { name: 'Welds logged on this job' });
    await logged.getByText('Flagged · waiting for a disposition').waitFor();
    expect(await logged.locator('tbody tr').count()).toBe(2);
    // Usable on a tablet: the page itself does not scroll sideways (the entry table scrolls in its box).
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
    expect(overflow).toBeLessThanOrEqual(1);
    expect(errors).toEqual([]);
  });

  it('the QA manager dispositions the flagged weld from the review queue and prints the weld page', async () => {
    qa = await newSession(browser);
    const { page } = qa;
    await signIn(page, demo.qa.email);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Weld log' }).click();
    const queue = page.getByRole('region', { name: /Flagged welds waiting for a disposition/ });
    await queue.getByRole('link', { name: 'Review weld 2' }).first().waitFor();
    await queue.locator('li', { hasText: job }).getByRole('link', { name: 'Review weld 2' }).click();
    await page.getByRole('heading', { name: `Weld 2 · job ${job}` }).waitFor();
    await page.getByText(/Not qualified for this joint/).waitFor();
    await page.getByText(/QW-452\.1/).first().waitFor();

    await page.getByRole('button', { name: 'Record disposition' }).click();
    await page.getByText('Choose what was decided').waitFor();
    await page.getByLabel('Decision').selectOption('cut-out');
    await page.getByLabel('Reason').fill('Cut out and rewelded by a welder qualified for the wall');
    await page.getByRole('button', { name: 'Record disposition' }).click();
    await page.getByText(/Cut out — Cut out and rewelded/).waitFor();

    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Weld page (PDF)' }).click()]);
    const path = await download.path();
    const { readFile } = await import('node:fs/promises');
    const pdf = await readFile(path);
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(download.suggestedFilename()).toBe(`weld-${job}-2.pdf`);
  });
});

import type { Page } from 'playwright-core';
import { expect } from 'vitest';

/**
 * Layout checks the browser tests share. After a viewport change the trade-off plot redraws to its
 * new width from a ResizeObserver callback, after the resize itself: the page must fit once it has
 * reacted, so the overflow is polled (up to 5 s), not read once.
 */
export async function expectNoSidewaysScroll(page: Page): Promise<void> {
  await expect
    .poll(() => page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth), {
      timeout: 5_000,
    })
    .toBeLessThanOrEqual(0);
}

/** A header cell of the plan table: its text, whether it is shown, and its right edge in px. */
export interface PlanTableHeader {
  text: string | null;
  visible: boolean;
  right: number;
}

/** The plan table's header cells as the page lays them out now. */
export function planTableHeaders(page: Page): Promise<PlanTableHeader[]> {
  return page.$$eval('#planTable thead th', (ths) =>
    ths.map((th) => ({
      text: th.textContent,
      visible: (th as HTMLElement).offsetParent !== null,
      right: th.getBoundingClientRect().right,
    })),
  );
}

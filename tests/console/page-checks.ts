import type { Page } from 'playwright-core';

// In-page checks shared by the console's browser tests.

/** Every form control and button that has no accessible name (label, aria-label(ledby), text, title). */
export async function unlabelledControls(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const textOf = (ids: string) =>
      ids
        .split(/\s+/)
        .map((id) => document.getElementById(id)?.textContent ?? '')
        .join(' ')
        .trim();
    const nameOf = (el: Element): string => {
      const aria = el.getAttribute('aria-label')?.trim();
      if (aria) return aria;
      const by = el.getAttribute('aria-labelledby');
      if (by && textOf(by)) return textOf(by);
      const labels = (el as HTMLInputElement).labels;
      if (labels && labels.length) {
        const t = Array.from(labels).map((l) => l.textContent ?? '').join(' ').trim();
        if (t) return t;
      }
      if (el.tagName === 'BUTTON' || el.getAttribute('role') === 'button') {
        const t = el.textContent?.trim();
        if (t) return t;
      }
      if (el.tagName === 'FIELDSET') return el.querySelector('legend')?.textContent?.trim() ?? '';
      return el.getAttribute('title')?.trim() ?? '';
    };
    return Array.from(document.querySelectorAll('input:not([type=hidden]), select, textarea, button, [role=button], [tabindex]:not([tabindex="-1"])'))
      .filter((el) => !nameOf(el))
      .map((el) => el.outerHTML.slice(0, 160));
  });
}

/**
 * Presses Tab `presses` times from the top of the page (a throw-away focus target placed before
 * everything else, so the walk does not start where the last click left focus) and describes each stop.
 */
export async function tabStops(page: Page, presses: number): Promise<string[]> {
  await page.evaluate(() => {
    window.scrollTo(0, 0);
    const start = document.createElement('span');
    start.tabIndex = -1;
    start.id = 'tab-walk-start';
    document.body.prepend(start);
    start.focus();
    start.addEventListener('blur', () => start.remove(), { once: true });
  });
  const stops: string[] = [];
  for (let i = 0; i < presses; i++) {
    await page.keyboard.press('Tab');
    stops.push(
      await page.evaluate(() => {
        const el = document.activeElement as HTMLElement | null;
        if (!el || el === document.body) return 'body';
        return el.id ? `#${el.id}` : el.dataset.sort ? `sort:${el.dataset.sort}` : `${el.tagName.toLowerCase()}:${(el.getAttribute('aria-label') ?? el.textContent ?? '').trim().slice(0, 40)}`;
      }),
    );
  }
  return stops;
}

/** Counts canvas pixels that differ from white in the plot of a chart (sampled on a grid). */
export async function inkedPixels(page: Page, chartSelector: string): Promise<number> {
  return page.evaluate((selector) => {
    const canvas = document.querySelector(`${selector} canvas`) as HTMLCanvasElement | null;
    if (!canvas) return -1;
    const ctx = canvas.getContext('2d')!;
    const { data } = ctx.getImageData(0, 0, canvas.width, canvas.height);
    let inked = 0;
    for (let i = 0; i < data.length; i += 4 * 7) {
      const alpha = data[i + 3]!;
      if (alpha > 0 && (data[i]! < 200 || data[i + 1]! < 200 || data[i + 2]! < 200)) inked++;
    }
    return inked;
  }, chartSelector);
}

/** Keyboard-only walking for end-to-end tests: Tab until focus reaches an element, and where focus is. */
import type { Page } from 'playwright-core';

/** A short description of the focused element (tag, id, classes, accessible-ish text), for failures. */
export function focusedDescription(page: Page): Promise<string> {
  return page.evaluate(() => {
    const el = document.activeElement;
    if (!el) return 'nothing';
    const text = (el.getAttribute('aria-label') ?? el.textContent ?? '').replace(/\s+/g, ' ').trim().slice(0, 60);
    return `${el.tagName.toLowerCase()}${el.id ? `#${el.id}` : ''}${el.classList.length ? `.${[...el.classList].slice(0, 3).join('.')}` : ''} "${text}"`;
  });
}

/** Whether the focused element matches CSS `selector`. */
export function isFocused(page: Page, selector: string): Promise<boolean> {
  return page.evaluate((sel) => document.activeElement?.matches(sel) ?? false, selector);
}

/**
 * Presses Tab (Shift+Tab when `backwards`) until the focused element matches `selector`; the
 * number of presses. Fails after `max` presses, naming where focus went.
 */
export async function tabUntil(page: Page, selector: string, max = 80, backwards = false): Promise<number> {
  const seen: string[] = [];
  for (let n = 1; n <= max; n++) {
    await page.keyboard.press(backwards ? 'Shift+Tab' : 'Tab');
    if (await isFocused(page, selector)) return n;
    if (seen.length < 200) seen.push(await focusedDescription(page));
  }
  throw new Error(`focus did not reach ${selector} in ${max} presses of ${backwards ? 'Shift+Tab' : 'Tab'}; it went to:\n${seen.join('\n')}`);
}

/** Where the focused element lies against the first element matching `selector`: inside it, before or after it. */
export function focusAgainst(page: Page, selector: string): Promise<'inside' | 'before' | 'after' | 'none'> {
  return page.evaluate((sel) => {
    const el = document.activeElement;
    const ref = document.querySelector(sel);
    if (!el || !ref || el === document.body) return 'none';
    if (ref.contains(el)) return 'inside';
    return ref.compareDocumentPosition(el) & Node.DOCUMENT_POSITION_FOLLOWING ? 'after' : 'before';
  }, selector);
}

/** The focus indicator of the focused element: its outline and that outline's contrast against the backdrop. */
export interface FocusRing {
  readonly element: string;
  readonly style: string;
  readonly widthPx: number;
  /** Contrast ratio of the outline colour against the first opaque background behind the element. */
  readonly contrast: number;
}

/**
 * Measures the outline the focused element shows. Contrast ratio and relative luminance as WCAG 2.1
 * defines them (Understanding WCAG 2.1, "contrast ratio" and "relative luminance" in the glossary):
 * (L1 + 0.05) / (L2 + 0.05) with L from linearised sRGB channels weighted 0.2126, 0.7152, 0.0722.
 */
export function focusRing(page: Page): Promise<FocusRing> {
  return page.evaluate(() => {
    const el = document.activeElement as HTMLElement | null;
    if (!el) throw new Error('nothing has focus');
    const rgb = (css: string): [number, number, number, number] => {
      const m = /rgba?\(([\d.]+)[ ,]+([\d.]+)[ ,]+([\d.]+)(?:[ ,/]+([\d.]+))?\)/.exec(css);
      if (!m) throw new Error(`unread colour ${css}`);
      return [Number(m[1]), Number(m[2]), Number(m[3]), m[4] === undefined ? 1 : Number(m[4])];
    };
    const luminance = ([r, g, b]: number[]) => {
      const lin = (c: number) => { const s = c / 255; return s <= 0.03928 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4; };
      return 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b);
    };
    let backdrop: [number, number, number, number] = [255, 255, 255, 1];
    // The backdrop round the ring: the element's own box is inside the ring, so start at its parent.
    for (let n = el.parentElement; n; n = n.parentElement) {
      const c = rgb(getComputedStyle(n).backgroundColor);
      if (c[3] > 0.5) { backdrop = c; break; }
    }
    const style = getComputedStyle(el);
    const ring = rgb(style.outlineColor);
    const [a, b] = [luminance(ring), luminance(backdrop)];
    return {
      element: `${el.tagName.toLowerCase()} "${(el.getAttribute('aria-label') ?? el.textContent ?? '').trim().slice(0, 40)}"`,
      style: style.outlineStyle,
      widthPx: parseFloat(style.outlineWidth),
      contrast: Math.round(((Math.max(a, b) + 0.05) / (Math.min(a, b) + 0.05)) * 100) / 100,
    };
  });
}

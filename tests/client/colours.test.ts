import { describe, expect, it } from 'vitest';
import { instrumentColour, instrumentPalette } from '../../src/features/bookings/utils/colours.js';

/** WCAG 2 contrast ratio of a #rrggbb colour against white. */
function contrastWithWhite(hex: string): number {
  const [r, g, b] = [1, 3, 5].map((i) => {
    const c = parseInt(hex.slice(i, i + 2), 16) / 255;
    return c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  });
  return 1.05 / (0.2126 * r! + 0.7152 * g! + 0.0722 * b! + 0.05);
}

describe('instrument colours on the calendar', () => {
  it('are the same for the same instrument and differ for a run of consecutive ids', () => {
    expect(instrumentColour(7)).toBe(instrumentColour(7));
    const run = Array.from({ length: instrumentPalette.length }, (_, i) => instrumentColour(i + 1));
    expect(new Set(run).size).toBe(instrumentPalette.length);
  });

  it('carry white event text readably (contrast at least 4.5:1, WCAG 2 AA)', () => {
    for (const colour of instrumentPalette) expect(contrastWithWhite(colour)).toBeGreaterThanOrEqual(4.5);
  });
});

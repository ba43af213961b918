import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { contrastRatio } from '@/lib/contrast';

// WCAG 2.2 SC 1.4.3 (Contrast, Minimum), level AA: 4.5:1 for normal-size text.
const AA_NORMAL_TEXT = 4.5;

function themeColours(): Record<string, string> {
  // The CSS is read as text: the test checks the real theme file, not a copy of its values.
  const css = readFileSync(resolve(__dirname, '../index.css'), 'utf8');
  const out: Record<string, string> = {};
  for (const m of css.matchAll(/--color-([a-z-]+):\s*(#[0-9a-fA-F]{3,6})\s*;/g)) out[m[1]!] = m[2]!;
  return out;
}

/** Every text colour / background colour pair the components use (see the class names in src/). */
const PAIRS: [text: string, background: string, where: string][] = [
  ['slate', 'cloth', 'body text on the page'],
  ['slate', 'cloth-raised', 'text in cards, inputs, secondary buttons'],
  ['slate', 'cloth-sunk', 'booked-in badge, hover rows, invitation summary'],
  ['slate-soft', 'cloth', 'hints and secondary text on the page'],
  ['slate-soft', 'cloth-raised', 'hints and table headers in cards'],
  ['slate-soft', 'cloth-sunk', 'labels in the invitation summary'],
  ['harbour-deep', 'cloth', 'links on the page'],
  ['harbour-deep', 'cloth-raised', 'links in cards'],
  ['harbour-deep', 'cloth-sunk', 'quiet button on hover'],
  ['on-harbour', 'harbour', 'primary button, active navigation, ready-for-release badge'],
  ['on-harbour', 'harbour-deep', 'primary button on hover'],
  ['harbour-deep', 'harbour-tint', 'inspecting and in-work badges'],
  ['slate', 'harbour-tint', 'information notices'],
  ['dusk', 'dusk-tint', 'awaiting-owner badge'],
  ['slate-deep', 'cloth-raised', 'invoiced and paid badges'],
  ['on-harbour', 'slate-deep', 'closed badge'],
  ['ember', 'cloth', 'airworthiness signal on the page'],
  ['ember', 'ember-tint', 'airworthiness badge and release guard'],
  ['slate', 'ember-tint', 'release guard text'],
  ['fault', 'cloth-raised', 'field error messages'],
  ['fault', 'cloth', 'error messages on the page'],
  ['slate', 'fault-tint', 'problem notices'],
  ['fault', 'fault-tint', 'problem notice icon'],
];

describe('theme contrast (WCAG 2.2 AA)', () => {
  const colours = themeColours();

  it('reads the palette from the theme', () => {
    expect(Object.keys(colours).length).toBeGreaterThanOrEqual(15);
  });

  it.each(PAIRS)('%s on %s (%s) is at least 4.5:1', (text, bg) => {
    const fg = colours[text];
    const back = colours[bg];
    expect(fg, `--color-${text}`).toBeDefined();
    expect(back, `--color-${bg}`).toBeDefined();
    expect(contrastRatio(fg!, back!)).toBeGreaterThanOrEqual(AA_NORMAL_TEXT);
  });
});

describe('contrastRatio', () => {
  it('gives 21:1 for black on white and 1:1 for a colour on itself', () => {
    expect(contrastRatio('#000000', '#ffffff')).toBeCloseTo(21, 5);
    expect(contrastRatio('#0b5e63', '#0b5e63')).toBe(1);
  });

  it('matches a known mid-grey value (#777 on white ≈ 4.48, just under AA)', () => {
    expect(contrastRatio('#777777', '#ffffff')).toBeCloseTo(4.48, 2);
  });
});

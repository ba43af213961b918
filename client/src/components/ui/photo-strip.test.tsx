import { fireEvent, render, screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { PhotoStrip, type StripPhoto } from './photo-strip';

const photos: StripPhoto[] = [
  { id: 'p1', width: 2048, height: 1536, thumbWidth: 480, thumbHeight: 360 },
  { id: 'p2', width: 1536, height: 2048, thumbWidth: 360, thumbHeight: 480 },
  { id: 'p3', width: 2048, height: 1152, thumbWidth: 480, thumbHeight: 270 },
];
const thumb = (id: string) => `/api/photos/${id}?size=thumb`;
const full = (id: string) => `/api/photos/${id}?size=full`;
const LABEL = 'F-2: Cracked exhaust spring';

function renderStrip(list = photos) {
  return render(<PhotoStrip photos={list} label={LABEL} thumbSrc={thumb} fullSrc={full} />);
}

describe('PhotoStrip and its viewer', () => {
  it('shows each thumbnail lazily with its stored size and an alt text naming the photo and the finding', () => {
    renderStrip();
    const strip = screen.getByRole('list', { name: `Photos of ${LABEL}` });
    const imgs = within(strip).getAllByRole('img') as HTMLImageElement[];
    expect(imgs.map((i) => i.alt)).toEqual([`Photo 1 of ${LABEL}`, `Photo 2 of ${LABEL}`, `Photo 3 of ${LABEL}`]);
    expect(imgs.map((i) => i.getAttribute('src'))).toEqual(['/api/photos/p1?size=thumb', '/api/photos/p2?size=thumb', '/api/photos/p3?size=thumb']);
    expect(imgs.map((i) => [i.getAttribute('width'), i.getAttribute('height')])).toEqual([
      ['480', '360'],
      ['360', '480'],
      ['480', '270'],
    ]);
    expect(imgs.every((i) => i.getAttribute('loading') === 'lazy')).toBe(true);
  });

  it('shows nothing when the finding has no photos', () => {
    const { container } = renderStrip([]);
    expect(container.innerHTML).toBe('');
  });

  it('when a thumbnail is tapped, then a modal dialog shows the full picture with focus on Close; Escape closes it and focus returns', () => {
    renderStrip();
    const second = screen.getByRole('button', { name: `Photo 2 of ${LABEL}` });
    second.focus();
    fireEvent.click(second);
    const dialog = screen.getByRole('dialog', { name: `Photo 2 of 3 · ${LABEL}` });
    expect(dialog.getAttribute('aria-modal')).toBe('true');
    const big = within(dialog).getByRole('img') as HTMLImageElement;
    expect(big.getAttribute('src')).toBe('/api/photos/p2?size=full');
    expect(big.alt).toBe(`Photo 2 of ${LABEL}`);
    expect([big.getAttribute('width'), big.getAttribute('height')]).toEqual(['1536', '2048']);
    expect(document.activeElement).toBe(within(dialog).getByRole('button', { name: 'Close' }));
    expect(document.body.style.overflow).toBe('hidden');

    fireEvent.keyDown(dialog, { key: 'Escape' });
    expect(screen.queryByRole('dialog')).toBeNull();
    expect(document.activeElement).toBe(second);
    expect(document.body.style.overflow).toBe('');
  });

  it('moves between photos with the arrow keys and the buttons, wrapping at the ends, and closes with its button', () => {
    renderStrip();
    fireEvent.click(screen.getByRole('button', { name: `Photo 3 of ${LABEL}` }));
    const dialog = () => screen.getByRole('dialog');
    const shown = () => within(dialog()).getByRole('img').getAttribute('src');
    fireEvent.keyDown(dialog(), { key: 'ArrowRight' });
    expect(shown()).toBe('/api/photos/p1?size=full');
    expect(screen.getByRole('heading', { name: `Photo 1 of 3 · ${LABEL}` })).toBeTruthy();
    fireEvent.keyDown(dialog(), { key: 'ArrowLeft' });
    expect(shown()).toBe('/api/photos/p3?size=full');
    fireEvent.click(within(dialog()).getByRole('button', { name: '← Previous photo' }));
    expect(shown()).toBe('/api/photos/p2?size=full');
    fireEvent.click(within(dialog()).getByRole('button', { name: 'Next photo →' }));
    expect(shown()).toBe('/api/photos/p3?size=full');
    fireEvent.click(within(dialog()).getByRole('button', { name: 'Close' }));
    expect(screen.queryByRole('dialog')).toBeNull();
  });

  it('keeps Tab inside the dialog', () => {
    renderStrip();
    fireEvent.click(screen.getByRole('button', { name: `Photo 1 of ${LABEL}` }));
    const dialog = screen.getByRole('dialog');
    const close = within(dialog).getByRole('button', { name: 'Close' });
    const next = within(dialog).getByRole('button', { name: 'Next photo →' });
    next.focus();
    fireEvent.keyDown(dialog, { key: 'Tab' });
    expect(document.activeElement).toBe(close);
    fireEvent.keyDown(dialog, { key: 'Tab', shiftKey: true });
    expect(document.activeElement).toBe(next);
  });

  it('offers no previous/next for a single photo', () => {
    renderStrip(photos.slice(0, 1));
    fireEvent.click(screen.getByRole('button', { name: `Photo 1 of ${LABEL}` }));
    const dialog = screen.getByRole('dialog', { name: `Photo 1 of 1 · ${LABEL}` });
    expect(within(dialog).queryByRole('button', { name: /photo/ })).toBeNull();
  });
});

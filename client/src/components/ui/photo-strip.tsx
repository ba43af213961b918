import { useState, type ReactNode } from 'react';
import { PhotoViewer } from './photo-viewer';

export interface StripPhoto {
  id: string;
  width: number;
  height: number;
  thumbWidth: number;
  thumbHeight: number;
}

/**
 * A row of thumbnails for one finding; tapping one opens it large. The width and height attributes
 * come from the server's record of the stored picture, so the row keeps its shape while loading.
 */
export function PhotoStrip({
  photos,
  label,
  thumbSrc,
  fullSrc,
  below,
}: {
  photos: readonly StripPhoto[];
  /** The finding's number and title, e.g. "F-2: Cracked exhaust spring". */
  label: string;
  thumbSrc: (id: string) => string;
  fullSrc: (id: string) => string;
  /** Something under each thumbnail, e.g. a remove button. */
  below?: (photo: StripPhoto, index: number) => ReactNode;
}) {
  const [open, setOpen] = useState<number | null>(null);
  if (photos.length === 0) return null;
  const altFor = (i: number) => `Photo ${i + 1} of ${label}`;
  return (
    <>
      <ul aria-label={`Photos of ${label}`} className="flex flex-wrap gap-2">
        {photos.map((p, i) => (
          <li key={p.id} className="flex flex-col items-start gap-1">
            <button
              type="button"
              onClick={() => setOpen(i)}
              className="block overflow-hidden rounded-control border border-seam-strong bg-cloth-sunk hover:border-harbour"
              title="Open the photo large"
            >
              <img
                src={thumbSrc(p.id)}
                width={p.thumbWidth}
                height={p.thumbHeight}
                alt={altFor(i)}
                loading="lazy"
                decoding="async"
                className="block h-20 w-auto max-w-40 object-cover"
              />
            </button>
            {below?.(p, i)}
          </li>
        ))}
      </ul>
      {open !== null ? <PhotoViewer photos={photos} index={open} srcFor={fullSrc} altFor={altFor} title={label} onIndex={setOpen} onClose={() => setOpen(null)} /> : null}
    </>
  );
}

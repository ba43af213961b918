import { decidePhotoUrl, type SnapshotPhoto } from '@wingstage/shared';
import { useEffect, useRef, useState, type KeyboardEvent } from 'react';
import { CloseIcon, LensIcon } from '@/components/ui/icons';

interface Props {
  token: string;
  /** The finding's snapshot photos; an older snapshot may have none (undefined). */
  photos: SnapshotPhoto[] | undefined;
  number: string;
  title: string;
}

const altOf = (n: number, number: string, title: string) => `Photo ${n} of ${number}: ${title}`;

/**
 * A finding's photos, each the full width of the column with its size known up front (no jump as
 * it loads); only the first loads straight away. A tap opens it full screen.
 */
export function FindingPhotos({ token, photos = [], number, title }: Props) {
  const [open, setOpen] = useState<number | null>(null);
  const openers = useRef<(HTMLButtonElement | null)[]>([]);
  if (photos.length === 0) return null;
  return (
    <div className="flex flex-col gap-3" data-testid="decide-photos">
      <ul className="flex flex-col gap-3" aria-label={`Photos of ${number}`}>
        {photos.map((p, i) => (
          <li key={p.id}>
            <button
              type="button"
              ref={(el) => {
                openers.current[i] = el;
              }}
              onClick={() => setOpen(i)}
              className="relative block w-full cursor-zoom-in overflow-hidden rounded-card border border-seam bg-cloth-sunk"
            >
              <img
                src={decidePhotoUrl(token, p.id, 'full')}
                width={p.width}
                height={p.height}
                alt={altOf(i + 1, number, title)}
                loading={i === 0 ? 'eager' : 'lazy'}
                decoding="async"
                className="block h-auto w-full"
              />
              <span className="absolute right-2 bottom-2 inline-flex min-h-tap items-center gap-1 rounded-control bg-slate/85 px-3 text-sm font-semibold text-cloth-raised">
                <LensIcon size={16} />
                <span>
                  Full screen<span className="sr-only"> view</span>
                </span>
              </span>
            </button>
          </li>
        ))}
      </ul>
      {open !== null ? (
        <PhotoViewer
          token={token}
          photos={photos}
          index={open}
          number={number}
          title={title}
          onIndex={setOpen}
          onClose={() => {
            const back = openers.current[open];
            setOpen(null);
            back?.focus();
          }}
        />
      ) : null}
    </div>
  );
}

function PhotoViewer({
  token,
  photos,
  index,
  number,
  title,
  onIndex,
  onClose,
}: {
  token: string;
  photos: SnapshotPhoto[];
  index: number;
  number: string;
  title: string;
  onIndex: (i: number) => void;
  onClose: () => void;
}) {
  const closeRef = useRef<HTMLButtonElement>(null);
  const p = photos[index]!;
  const many = photos.length > 1;
  const go = (d: number) => onIndex((index + d + photos.length) % photos.length);

  useEffect(() => {
    closeRef.current?.focus();
    // The page underneath must not scroll while the photo fills the screen.
    const before = document.body.style.overflow;
    document.body.style.overflow = 'hidden';
    return () => {
      document.body.style.overflow = before;
    };
  }, []);

  const onKeyDown = (e: KeyboardEvent) => {
    if (e.key === 'Escape') {
      e.preventDefault();
      onClose();
    } else if (many && e.key === 'ArrowRight') go(1);
    else if (many && e.key === 'ArrowLeft') go(-1);
    else if (e.key === 'Tab') {
      // Keep focus inside the viewer: its buttons are its only stops.
      const stops = [...(e.currentTarget as HTMLElement).querySelectorAll<HTMLButtonElement>('button')];
      const at = stops.indexOf(document.activeElement as HTMLButtonElement);
      const next = e.shiftKey ? (at <= 0 ? stops.length - 1 : at - 1) : at === stops.length - 1 ? 0 : at + 1;
      e.preventDefault();
      stops[next]?.focus();
    }
  };

  return (
    <div
      role="dialog"
      aria-modal="true"
      aria-label={altOf(index + 1, number, title)}
      onKeyDown={onKeyDown}
      className="fixed inset-0 z-50 flex flex-col bg-slate text-cloth-raised"
      data-testid="photo-viewer"
    >
      <div className="flex items-center justify-between gap-3 px-gutter py-2">
        <p className="text-sm font-semibold tabular-nums" aria-live="polite">
          {number} · photo {index + 1} of {photos.length}
        </p>
        <button
          ref={closeRef}
          type="button"
          onClick={onClose}
          className="inline-flex min-h-tap items-center gap-2 rounded-control border border-cloth-raised px-4 font-semibold focus-visible:outline-cloth-raised"
        >
          <CloseIcon size={20} />
          Close
        </button>
      </div>
      <div className="flex min-h-0 flex-1 items-center justify-center" onClick={onClose}>
        <img
          key={p.id}
          src={decidePhotoUrl(token, p.id, 'full')}
          width={p.width}
          height={p.height}
          alt={altOf(index + 1, number, title)}
          className="h-auto max-h-full w-auto max-w-full object-contain"
          onClick={(e) => e.stopPropagation()}
        />
      </div>
      {many ? (
        <div className="flex gap-3 px-gutter py-3">
          <button type="button" onClick={() => go(-1)} className="inline-flex min-h-tap flex-1 items-center justify-center rounded-control border border-cloth-raised font-semibold focus-visible:outline-cloth-raised">
            ← Previous photo
          </button>
          <button type="button" onClick={() => go(1)} className="inline-flex min-h-tap flex-1 items-center justify-center rounded-control border border-cloth-raised font-semibold focus-visible:outline-cloth-raised">
            Next photo →
          </button>
        </div>
      ) : null}
    </div>
  );
}

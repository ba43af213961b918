import { useEffect, useId, useRef, type KeyboardEvent } from 'react';
import { createPortal } from 'react-dom';
import { Button, buttonClass } from './button';
import { CloseIcon } from './icons';

export interface ViewerPhoto {
  id: string;
  width: number;
  height: number;
}

const FOCUSABLE = 'button:not([disabled]), a[href], [tabindex]:not([tabindex="-1"])';

/**
 * One photo shown as large as the screen allows, in a modal dialog: the close button takes focus,
 * Escape closes, Tab stays inside, the arrow keys and the two buttons move between several photos,
 * and focus goes back to whatever opened it.
 */
export function PhotoViewer({
  photos,
  index,
  srcFor,
  altFor,
  title,
  onIndex,
  onClose,
}: {
  photos: readonly ViewerPhoto[];
  index: number;
  srcFor: (id: string) => string;
  altFor: (i: number) => string;
  /** What the photos belong to, e.g. "F-2: Cracked exhaust spring". */
  title: string;
  onIndex: (i: number) => void;
  onClose: () => void;
}) {
  const headingId = useId();
  const dialogRef = useRef<HTMLDivElement>(null);
  const closeRef = useRef<HTMLButtonElement>(null);
  const photo = photos[index];
  const many = photos.length > 1;

  useEffect(() => {
    const opener = document.activeElement instanceof HTMLElement ? document.activeElement : null;
    const overflow = document.body.style.overflow;
    document.body.style.overflow = 'hidden';
    closeRef.current?.focus();
    return () => {
      document.body.style.overflow = overflow;
      opener?.focus();
    };
  }, []);

  if (!photo) return null;

  const go = (step: number) => onIndex((index + step + photos.length) % photos.length);

  const onKeyDown = (e: KeyboardEvent<HTMLDivElement>) => {
    if (e.key === 'Escape') {
      e.preventDefault();
      onClose();
    } else if (many && e.key === 'ArrowRight') {
      e.preventDefault();
      go(1);
    } else if (many && e.key === 'ArrowLeft') {
      e.preventDefault();
      go(-1);
    } else if (e.key === 'Tab') {
      const items = [...(dialogRef.current?.querySelectorAll<HTMLElement>(FOCUSABLE) ?? [])];
      if (items.length === 0) return;
      const first = items[0]!;
      const last = items[items.length - 1]!;
      if (e.shiftKey && document.activeElement === first) {
        e.preventDefault();
        last.focus();
      } else if (!e.shiftKey && document.activeElement === last) {
        e.preventDefault();
        first.focus();
      }
    }
  };

  return createPortal(
    <div
      ref={dialogRef}
      role="dialog"
      aria-modal="true"
      aria-labelledby={headingId}
      onKeyDown={onKeyDown}
      className="fixed inset-0 z-50 flex flex-col bg-slate text-on-harbour"
    >
      <div className="flex items-center justify-between gap-3 px-3 py-2 sm:px-5">
        <h2 id={headingId} className="min-w-0 truncate text-base font-semibold">
          <span className="tabular-nums">
            Photo {index + 1} of {photos.length}
          </span>{' '}
          · {title}
        </h2>
        <button ref={closeRef} type="button" onClick={onClose} className={buttonClass('secondary', 'lg', 'shrink-0')}>
          <CloseIcon />
          Close
        </button>
      </div>
      <div className="flex min-h-0 flex-1 items-center justify-center px-2 pb-2" onClick={(e) => e.target === e.currentTarget && onClose()}>
        <img
          key={photo.id}
          src={srcFor(photo.id)}
          width={photo.width}
          height={photo.height}
          alt={altFor(index)}
          className="h-auto max-h-full w-auto max-w-full object-contain"
        />
      </div>
      {many ? (
        <div className="flex items-center justify-between gap-3 px-3 pb-3 sm:justify-center sm:px-5">
          <Button variant="secondary" size="lg" onClick={() => go(-1)}>
            ← Previous photo
          </Button>
          <Button variant="secondary" size="lg" onClick={() => go(1)}>
            Next photo →
          </Button>
        </div>
      ) : null}
    </div>,
    document.body,
  );
}

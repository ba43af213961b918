import { PHOTO_LIMITS } from '@wingstage/shared';
import { useEffect, useState, type ChangeEvent } from 'react';
import { Button, buttonClass } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { checkPhotoFiles, formatFileSize, photoRoom, roomSentence } from './photo-files';

const ACCEPT = PHOTO_LIMITS.acceptedTypes.join(',');

let nextKey = 0;
const keys = new WeakMap<File, number>();
function keyOf(f: File): number {
  let k = keys.get(f);
  if (k === undefined) {
    k = ++nextKey;
    keys.set(f, k);
  }
  return k;
}

/** A chosen file's preview owns its object URL: made when shown, revoked when removed or unmounted. */
function Preview({ file, index, onRemove, disabled }: { file: File; index: number; onRemove: () => void; disabled?: boolean }) {
  const [url, setUrl] = useState<string | null>(null);
  useEffect(() => {
    const u = URL.createObjectURL(file);
    setUrl(u);
    return () => URL.revokeObjectURL(u);
  }, [file]);
  return (
    <li className="flex w-28 flex-col gap-1" data-chosen-photo={file.name}>
      <div className="flex h-24 w-28 items-center justify-center overflow-hidden rounded-control border border-seam-strong bg-cloth-sunk">
        {url ? <img src={url} alt={`Chosen photo ${index + 1}: ${file.name}`} className="h-full w-full object-cover" /> : null}
      </div>
      <span className="truncate text-xs" title={file.name}>
        {file.name}
      </span>
      <span className="text-xs text-slate-soft tabular-nums">{formatFileSize(file.size)}</span>
      <Button variant="secondary" onClick={onRemove} disabled={disabled} aria-label={`Remove chosen photo ${index + 1} (${file.name})`}>
        Remove
      </Button>
    </li>
  );
}

/**
 * Two ways to pick photos for a finding, previews of what was picked, and the reasons any file
 * was left out. The phone's camera opens straight from "Take a photo"; "Choose pictures" picks
 * several existing ones. Nothing is sent from here: the caller uploads `files`.
 */
export function PhotoPicker({
  files,
  onChange,
  existing = 0,
  disabled = false,
}: {
  files: readonly File[];
  onChange: (files: File[]) => void;
  /** Photos the finding already holds. */
  existing?: number;
  disabled?: boolean;
}) {
  const [refused, setRefused] = useState<string[]>([]);
  const room = photoRoom(existing, files.length);

  const add = async (e: ChangeEvent<HTMLInputElement>) => {
    const input = e.currentTarget;
    const picked = [...(input.files ?? [])];
    // Let the same file be picked again after removing it.
    input.value = '';
    if (picked.length === 0) return;
    const { accepted, refused: why } = await checkPhotoFiles(picked, room);
    setRefused(why);
    if (accepted.length > 0) onChange([...files, ...accepted]);
  };

  const full = room <= 0;
  const pickClass = buttonClass('secondary', 'lg', `focus-within:outline-3 focus-within:outline-harbour focus-within:outline-offset-2 ${full || disabled ? 'pointer-events-none opacity-60' : 'cursor-pointer'}`);

  return (
    <div className="flex flex-col gap-3">
      <div className="grid gap-2 sm:flex sm:flex-wrap">
        <label className={pickClass}>
          <input type="file" accept={ACCEPT} capture="environment" className="sr-only" onChange={(e) => void add(e)} disabled={full || disabled} />
          Take a photo
        </label>
        <label className={pickClass}>
          <input type="file" accept={ACCEPT} multiple className="sr-only" onChange={(e) => void add(e)} disabled={full || disabled} />
          Choose pictures
        </label>
      </div>
      <p className="text-xs text-slate-soft">
        JPEG, PNG or WebP, up to {formatFileSize(PHOTO_LIMITS.maxBytes)} each; {PHOTO_LIMITS.maxFilesPerUpload} at a time, {PHOTO_LIMITS.maxPerFinding} per finding.
        Location and other camera details are removed when the photo is stored.
        {full && files.length > 0 ? ` ${roomSentence(0).replace(/^no/, 'No')}` : ''}
      </p>
      {refused.length > 0 ? (
        <Notice tone="problem" title={refused.length === 1 ? 'One file was not added' : `${refused.length} files were not added`}>
          <ul className="list-disc pl-5">
            {refused.map((r) => (
              <li key={r}>{r}</li>
            ))}
          </ul>
        </Notice>
      ) : null}
      {files.length > 0 ? (
        <ul aria-label="Chosen photos" className="flex flex-wrap gap-3">
          {files.map((f, i) => (
            <Preview
              key={keyOf(f)}
              file={f}
              index={i}
              disabled={disabled}
              onRemove={() => {
                setRefused([]);
                onChange(files.filter((x) => x !== f));
              }}
            />
          ))}
        </ul>
      ) : null}
    </div>
  );
}

/** How far an upload has gone, in words and as a bar. */
export function UploadProgress({ count, fraction }: { count: number; fraction: number }) {
  const pct = Math.round(fraction * 100);
  return (
    <div role="status" className="flex flex-col gap-1 text-sm" data-upload-progress={pct}>
      <span>
        {pct >= 100 ? 'Photos sent; the server is storing them…' : `Sending ${count === 1 ? 'the photo' : `${count} photos`}… `}
        {pct < 100 ? <span className="tabular-nums">{pct}%</span> : null}
      </span>
      <progress max={100} value={pct} aria-label="Photos sent so far" className="h-2 w-full max-w-80 accent-harbour" />
    </div>
  );
}

import { PHOTO_LIMITS, photoUrl, type FindingDto } from '@wingstage/shared';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { PhotoStrip } from '@/components/ui/photo-strip';
import { isApiError } from '@/lib/api-client';
import { useRemoveFindingPhoto, useUploadFindingPhotos } from '../api/finding-photos';
import { PhotoPicker, UploadProgress } from './photo-picker';
import type { UnsentPhotos } from './raise-finding';

const thumb = (id: string) => photoUrl(id, 'thumb');
const full = (id: string) => photoUrl(id, 'full');

export function photoLabel(f: Pick<FindingDto, 'number' | 'title'>): string {
  return `${f.number}: ${f.title}`;
}

/** The finding's photos, read-only: for anyone who may see the finding. */
export function FindingPhotoStrip({ finding }: { finding: FindingDto }) {
  return <PhotoStrip photos={finding.photos} label={photoLabel(finding)} thumbSrc={thumb} fullSrc={full} />;
}

/**
 * The finding's photos on a staff card. Those who may raise findings may add photos and remove
 * one (after saying so twice) while the finding is not withdrawn. Photos that failed to go with a
 * newly raised finding arrive as `unsent` and wait here, with the reason, for another try.
 */
export function FindingPhotos({
  jobId,
  finding: f,
  canEdit,
  unsent,
  onUnsentSettled,
}: {
  jobId: string;
  finding: FindingDto;
  canEdit: boolean;
  unsent?: UnsentPhotos | null;
  onUnsentSettled?: () => void;
}) {
  const editable = canEdit && f.state !== 'withdrawn';
  const upload = useUploadFindingPhotos(jobId);
  const remove = useRemoveFindingPhoto(jobId);
  const [adding, setAdding] = useState(Boolean(unsent));
  const [files, setFiles] = useState<File[]>(unsent?.files ?? []);
  const [problem, setProblem] = useState<string | null>(unsent?.message ?? null);
  const [done, setDone] = useState<string | null>(null);
  const [confirming, setConfirming] = useState<string | null>(null);
  const [progress, setProgress] = useState<number | null>(null);
  const label = photoLabel(f);
  // Photos handed back after this card first showed (the failed upload came after the new finding
  // was listed): open the add panel with them and the reason.
  const [seenUnsent, setSeenUnsent] = useState(unsent);
  if (unsent !== seenUnsent) {
    setSeenUnsent(unsent);
    if (unsent) {
      setAdding(true);
      setFiles(unsent.files);
      setProblem(unsent.message);
      setDone(null);
    }
  }

  if (f.photos.length === 0 && !editable) return null;

  const close = () => {
    setAdding(false);
    setFiles([]);
    setProblem(null);
    if (unsent) onUnsentSettled?.();
  };

  const send = async () => {
    setProblem(null);
    setDone(null);
    setProgress(0);
    try {
      const stored = await upload.mutateAsync({ findingId: f.id, files, onProgress: setProgress });
      close();
      setDone(`${stored.length === 1 ? '1 photo' : `${stored.length} photos`} attached to ${f.number}.`);
    } catch (e) {
      setProblem(isApiError(e) ? e.message : 'The upload did not finish. Please try again.');
    } finally {
      setProgress(null);
    }
  };

  const confirmIndex = confirming ? f.photos.findIndex((p) => p.id === confirming) : -1;
  const removeNow = async (photoId: string) => {
    setProblem(null);
    setDone(null);
    try {
      await remove.mutateAsync({ findingId: f.id, photoId });
      setConfirming(null);
      setDone(`Photo removed from ${f.number}.`);
    } catch (e) {
      setConfirming(null);
      setProblem(isApiError(e) ? e.message : 'The photo was not removed. Please try again.');
    }
  };

  return (
    <div className="flex flex-col gap-2" data-finding-photos={f.number}>
      <PhotoStrip
        photos={f.photos}
        label={label}
        thumbSrc={thumb}
        fullSrc={full}
        below={
          editable
            ? (p, i) => (
                <Button variant="secondary" className="w-full" onClick={() => setConfirming(p.id)} aria-label={`Remove photo ${i + 1} of ${f.number}`} disabled={remove.isPending}>
                  Remove
                </Button>
              )
            : undefined
        }
      />
      {confirmIndex >= 0 ? (
        <div role="group" aria-label="Confirm removal" className="flex flex-col gap-2 rounded-control border border-seam-strong bg-cloth-sunk p-3 text-sm">
          <p>
            Remove photo {confirmIndex + 1} from {f.number}? A request already sent to the owner keeps showing it.
          </p>
          <div className="flex flex-wrap gap-2">
            <Button busy={remove.isPending} onClick={() => void removeNow(confirming!)}>
              Remove photo {confirmIndex + 1}
            </Button>
            <Button variant="secondary" onClick={() => setConfirming(null)} disabled={remove.isPending}>
              Keep it
            </Button>
          </div>
        </div>
      ) : null}
      {done ? (
        <p role="status" className="text-sm">
          {done}
        </p>
      ) : null}
      {problem && !adding ? (
        <p role="alert" className="text-sm font-semibold text-fault">
          {problem}
        </p>
      ) : null}
      {editable && !adding && f.photos.length < PHOTO_LIMITS.maxPerFinding ? (
        <div>
          <Button
            variant="secondary"
            onClick={() => {
              setDone(null);
              setProblem(null);
              setAdding(true);
            }}
          >
            Add photos
          </Button>
        </div>
      ) : null}
      {editable && adding ? (
        <div role="group" aria-label={`Add photos to ${f.number}`} className="flex flex-col gap-3 rounded-control border border-seam p-3">
          {problem ? (
            <Notice tone="problem" title="The photos were not attached">
              <p>{problem}</p>
              <p>They are still here: try again, or remove the ones that were refused.</p>
            </Notice>
          ) : null}
          <PhotoPicker files={files} onChange={setFiles} existing={f.photos.length} disabled={upload.isPending} />
          {progress !== null ? <UploadProgress count={files.length} fraction={progress} /> : null}
          <div className="flex flex-wrap gap-2">
            <Button busy={upload.isPending} disabled={files.length === 0} onClick={() => void send()}>
              {problem ? 'Try again' : files.length === 0 ? 'Attach photos' : files.length === 1 ? 'Attach 1 photo' : `Attach ${files.length} photos`}
            </Button>
            <Button variant="secondary" onClick={close} disabled={upload.isPending}>
              {unsent ? 'Discard these photos' : 'Cancel'}
            </Button>
          </div>
        </div>
      ) : null}
    </div>
  );
}

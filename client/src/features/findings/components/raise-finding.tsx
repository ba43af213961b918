import type { FindingDto, WorkshopDto } from '@wingstage/shared';
import { isApiError } from '@/lib/api-client';
import { useUploadFindingPhotos } from '../api/finding-photos';
import { useRaiseFinding } from '../api/record-work';
import { useState } from 'react';
import { FindingForm, type FindingPrefill } from './finding-form';
import { UploadProgress } from './photo-picker';

/** Photos that did not reach the server with their finding, kept so they can be sent again. */
export interface UnsentPhotos {
  files: File[];
  /** The server's reason, in its own words. */
  message: string;
}

export interface RaiseOutcome {
  finding: FindingDto;
  /** How many photos were stored with it. */
  photosAttached: number;
  unsent: UnsentPhotos | null;
}

/**
 * Raising a finding with photos is two requests: the finding first (its own JSON call, so a
 * refused photo never costs the typed words), then the photos to it. A failed upload still
 * reports the finding as raised and hands the photos back for another try from its card.
 */
export function RaiseFinding({
  jobId,
  prefill,
  workshop,
  onCancel,
  onRaised,
}: {
  jobId: string;
  prefill?: FindingPrefill;
  workshop: Pick<WorkshopDto, 'labourRates'>;
  onCancel: () => void;
  onRaised: (outcome: RaiseOutcome) => void;
}) {
  const raise = useRaiseFinding(jobId);
  const upload = useUploadFindingPhotos(jobId);
  const [progress, setProgress] = useState<{ count: number; fraction: number } | null>(null);
  return (
    <FindingForm
      sending={progress ? <UploadProgress count={progress.count} fraction={progress.fraction} /> : null}
      prefill={prefill}
      workshop={workshop}
      onCancel={onCancel}
      onSubmit={async (v, files) => {
        const finding = await raise.mutateAsync(v);
        if (files.length === 0) return onRaised({ finding, photosAttached: 0, unsent: null });
        setProgress({ count: files.length, fraction: 0 });
        try {
          const stored = await upload.mutateAsync({ findingId: finding.id, files, onProgress: (fraction) => setProgress({ count: files.length, fraction }) });
          onRaised({ finding, photosAttached: stored.length, unsent: null });
        } catch (e) {
          const message = isApiError(e) ? e.message : 'The upload did not finish.';
          onRaised({ finding, photosAttached: 0, unsent: { files, message } });
        } finally {
          setProgress(null);
        }
      }}
    />
  );
}

/** The hangar's words for what happened, for a notice above the form's old place. */
export function describeRaise({ finding: f, photosAttached, unsent }: RaiseOutcome): { title: string; text: string; problem: boolean; number: string } {
  const name = `${f.number} “${f.title}”`;
  if (unsent) {
    const n = unsent.files.length;
    return {
      title: 'Finding saved; photos not attached',
      text: `${name} is saved and is with the manager to price, but its ${n === 1 ? 'photo was' : `${n} photos were`} not attached: ${unsent.message} Nothing you typed is lost. Try the ${n === 1 ? 'photo' : 'photos'} again from ${f.number}'s card.`,
      problem: true,
      number: f.number,
    };
  }
  const photos = photosAttached === 0 ? '' : photosAttached === 1 ? ', with 1 photo' : `, with ${photosAttached} photos`;
  return { title: 'Finding raised', text: `${name} is with the manager to price${photos}.`, problem: false, number: f.number };
}

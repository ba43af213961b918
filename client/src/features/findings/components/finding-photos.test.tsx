import type { FindingDto, FindingPhotoDto } from '@wingstage/shared';
import { act, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { jobKeysBase } from '@/lib/job-keys';
import { aFinding } from '@/testing/fixtures';
import { renderWithApp } from '@/testing/render';
import { jobWorkKeys } from '../api/keys';
import { FindingsList } from './findings-list';

const JOB = '5b0c1d7e-8f3a-4b61-9d2e-0a1b2c3d4e5f';
const FID = '7c1e2a3b-4d5e-4f60-8a9b-0c1d2e3f4a5b';

const photo = (id: string, i: number): FindingPhotoDto => ({
  id,
  findingId: FID,
  width: 2048,
  height: 1536,
  thumbWidth: 480,
  thumbHeight: 360,
  bytes: 400_000 + i,
  uploadedByName: 'Priya Tollervey',
  uploadedAt: '2026-11-30T10:05:00Z',
});

const finding: FindingDto = aFinding({ id: FID, jobId: JOB, photos: [photo('ph-1', 1), photo('ph-2', 2)] });

const jpeg = (name: string) => new File([new Uint8Array([0xff, 0xd8, 0xff, 0xe0, 0, 0x10])], name, { type: 'image/jpeg' });
function json(status: number, body: unknown): Response {
  return new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
}

describe('photos on a finding card', () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(() => {
    vi.stubGlobal('fetch', fetchMock);
    // These answer through fetch; the progress path (XMLHttpRequest) has its own test.
    vi.stubGlobal('XMLHttpRequest', undefined);
    document.cookie = 'ws_csrf=tok-7';
    vi.spyOn(URL, 'createObjectURL').mockImplementation((b) => `blob:${(b as File).name}`);
    vi.spyOn(URL, 'revokeObjectURL').mockImplementation(() => {});
  });
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
    document.cookie = 'ws_csrf=; expires=Thu, 01 Jan 1970 00:00:00 GMT';
  });

  it('shows the thumbnails to anyone, without changes when no edit rights are given', () => {
    renderWithApp(<FindingsList findings={[finding]} />);
    const strip = screen.getByRole('list', { name: 'Photos of F-2: Cracked exhaust spring' });
    expect(within(strip).getAllByRole('img').map((i) => i.getAttribute('src'))).toEqual(['/api/photos/ph-1?size=thumb', '/api/photos/ph-2?size=thumb']);
    expect(screen.queryByRole('button', { name: 'Add photos' })).toBeNull();
    expect(screen.queryByRole('button', { name: /Remove photo/ })).toBeNull();
  });

  it('offers no photo changes on a withdrawn finding, even to those who may raise findings', () => {
    renderWithApp(<FindingsList findings={[{ ...finding, state: 'withdrawn' }]} photos={{ jobId: JOB, canEdit: true }} />);
    expect(screen.getAllByRole('img', { name: /Photo \d of F-2/ })).toHaveLength(2);
    expect(screen.queryByRole('button', { name: 'Add photos' })).toBeNull();
    expect(screen.queryByRole('button', { name: /Remove photo/ })).toBeNull();
  });

  it('when photos are added from the card, then they are uploaded to that finding and the findings are fetched again', async () => {
    const { queryClient } = renderWithApp(<FindingsList findings={[finding]} photos={{ jobId: JOB, canEdit: true }} />);
    queryClient.setQueryData(jobWorkKeys.findings(JOB), [finding]);
    queryClient.setQueryData([...jobKeysBase.detail(JOB), 'estimate'], { untouched: true });
    queryClient.setQueryData([...jobKeysBase.detail(JOB), 'history'], []);
    fetchMock.mockImplementation(async (url, init) => {
      if (init?.method === 'POST') return json(201, [photo('ph-3', 3)]);
      return json(200, [finding]);
    });
    fireEvent.click(screen.getByRole('button', { name: 'Add photos' }));
    const panel = screen.getByRole('group', { name: 'Add photos to F-2' });
    fireEvent.change(within(panel).getByLabelText('Choose pictures'), { target: { files: [jpeg('hook-close.jpg')] } });
    const attach = await within(panel).findByRole('button', { name: 'Attach 1 photo' });
    fireEvent.click(attach);
    expect(await screen.findByText('1 photo attached to F-2.')).toBeTruthy();
    const post = fetchMock.mock.calls.find(([, init]) => init?.method === 'POST')!;
    expect(post[0]).toBe(`/api/jobs/${JOB}/findings/${FID}/photos`);
    expect(((post[1]!.body as FormData).getAll('photos') as File[]).map((f) => f.name)).toEqual(['hook-close.jpg']);
    await waitFor(() => expect(queryClient.getQueryState(jobWorkKeys.findings(JOB))?.isInvalidated).toBe(true));
    expect(queryClient.getQueryState([...jobKeysBase.detail(JOB), 'history'])?.isInvalidated).toBe(true);
    // Prices do not change with a photo: the estimate is left alone.
    expect(queryClient.getQueryState([...jobKeysBase.detail(JOB), 'estimate'])?.isInvalidated).toBe(false);
    expect(screen.queryByRole('group', { name: 'Add photos to F-2' })).toBeNull();
  });

  it('the room left on the finding limits how many can be chosen', async () => {
    const eleven = Array.from({ length: 11 }, (_, i) => photo(`ph-${i}`, i));
    renderWithApp(<FindingsList findings={[{ ...finding, photos: eleven }]} photos={{ jobId: JOB, canEdit: true }} />);
    fireEvent.click(screen.getByRole('button', { name: 'Add photos' }));
    fireEvent.change(screen.getByLabelText('Choose pictures'), { target: { files: [jpeg('a.jpg'), jpeg('b.jpg')] } });
    expect((await screen.findByRole('alert')).textContent).toContain('b.jpg left out: only 1 more photo fit here');
  });

  it('when a photo is removed, then it is asked about first and only a confirmed removal is sent', async () => {
    renderWithApp(<FindingsList findings={[finding]} photos={{ jobId: JOB, canEdit: true }} />);
    fetchMock.mockImplementation(async (_url, init) => (init?.method === 'DELETE' ? new Response(null, { status: 204 }) : json(200, [finding])));
    fireEvent.click(screen.getByRole('button', { name: 'Remove photo 2 of F-2' }));
    const ask = screen.getByRole('group', { name: 'Confirm removal' });
    expect(ask.textContent).toContain('Remove photo 2 from F-2? A request already sent to the owner keeps showing it.');
    fireEvent.click(within(ask).getByRole('button', { name: 'Keep it' }));
    expect(screen.queryByRole('group', { name: 'Confirm removal' })).toBeNull();
    expect(fetchMock).not.toHaveBeenCalled();

    fireEvent.click(screen.getByRole('button', { name: 'Remove photo 2 of F-2' }));
    fireEvent.click(within(screen.getByRole('group', { name: 'Confirm removal' })).getByRole('button', { name: 'Remove photo 2' }));
    expect(await screen.findByText('Photo removed from F-2.')).toBeTruthy();
    const del = fetchMock.mock.calls.find(([, init]) => init?.method === 'DELETE')!;
    expect(del[0]).toBe(`/api/jobs/${JOB}/findings/${FID}/photos/ph-2`);
    expect((del[1]!.headers as Record<string, string>)['X-CSRF-Token']).toBe('tok-7');
  });

  it('photos that failed with a new finding wait on its card with the reason, and go up on "Try again"', async () => {
    const settled = vi.fn();
    const unsent = { files: [jpeg('spring.jpg')], message: 'The server could not finish that. Please try again in a moment.' };
    renderWithApp(<FindingsList findings={[{ ...finding, photos: [] }]} photos={{ jobId: JOB, canEdit: true, unsent: { [FID]: unsent }, onUnsentSettled: settled }} />);
    const panel = screen.getByRole('group', { name: 'Add photos to F-2' });
    expect(within(panel).getByRole('alert').textContent).toContain(unsent.message);
    expect(within(panel).getByRole('img', { name: 'Chosen photo 1: spring.jpg' })).toBeTruthy();
    fetchMock.mockImplementation(async (_url, init) => (init?.method === 'POST' ? json(201, [photo('ph-9', 9)]) : json(200, [finding])));
    fireEvent.click(within(panel).getByRole('button', { name: 'Try again' }));
    expect(await screen.findByText('1 photo attached to F-2.')).toBeTruthy();
    expect(settled).toHaveBeenCalledWith(FID);
  });

  it('while photos go up from the card, then how far they have got is shown, and the reply closes the panel', async () => {
    let xhr: { upload: { onprogress: ((e: object) => void) | null }; onload: (() => void) | null; status: number; responseText: string; url: string } | null = null;
    class ProgressXhr {
      upload = { onprogress: null as ((e: object) => void) | null };
      onload: (() => void) | null = null;
      onerror: (() => void) | null = null;
      status = 0;
      responseText = '';
      url = '';
      withCredentials = false;
      constructor() {
        // eslint-disable-next-line @typescript-eslint/no-this-alias -- the test holds the request the component made
        xhr = this;
      }
      open(_m: string, url: string) {
        this.url = url;
      }
      setRequestHeader() {}
      send() {}
    }
    vi.stubGlobal('XMLHttpRequest', ProgressXhr);
    fetchMock.mockResolvedValue(json(200, [finding]));
    renderWithApp(<FindingsList findings={[finding]} photos={{ jobId: JOB, canEdit: true }} />);
    fireEvent.click(screen.getByRole('button', { name: 'Add photos' }));
    fireEvent.change(screen.getByLabelText('Choose pictures'), { target: { files: [jpeg('a.jpg'), jpeg('b.jpg')] } });
    fireEvent.click(await screen.findByRole('button', { name: 'Attach 2 photos' }));
    await waitFor(() => expect(xhr).not.toBeNull());
    expect(xhr!.url).toBe(`/api/jobs/${JOB}/findings/${FID}/photos`);
    act(() => xhr!.upload.onprogress?.({ lengthComputable: true, loaded: 40, total: 100 }));
    expect((await screen.findByText('40%')).closest('[role="status"]')!.textContent).toContain('Sending 2 photos… 40%');
    expect((screen.getByRole('progressbar', { name: 'Photos sent so far' }) as HTMLProgressElement).value).toBe(40);
    xhr!.status = 201;
    xhr!.responseText = JSON.stringify([photo('ph-3', 3), photo('ph-4', 4)]);
    act(() => xhr!.onload?.());
    expect(await screen.findByText('2 photos attached to F-2.')).toBeTruthy();
    expect(screen.queryByRole('progressbar')).toBeNull();
  });
});

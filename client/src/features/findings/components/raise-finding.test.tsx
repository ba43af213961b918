import { PHOTO_LIMITS, type FindingDto } from '@wingstage/shared';
import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { aFinding } from '@/testing/fixtures';
import { renderWithApp } from '@/testing/render';
import { describeRaise, RaiseFinding, type RaiseOutcome } from './raise-finding';

const JOB = '5b0c1d7e-8f3a-4b61-9d2e-0a1b2c3d4e5f';
const workshop = { labourRates: [{ code: 'standard', name: 'Standard', ratePerHour: '60.00' }] };

const created: FindingDto = aFinding({
  jobId: JOB,
  number: 'F-3',
  state: 'draft',
  remedy: { description: '', hours: null, labourRateCode: 'standard', parts: [], accessTask: null },
  version: 0,
});

const JPEG = [0xff, 0xd8, 0xff, 0xe0, 0, 0x10, 0x4a, 0x46, 0x49, 0x46, 0, 1];
const PNG = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 0x0d];
const jpeg = (name: string) => new File([new Uint8Array(JPEG)], name, { type: 'image/jpeg' });
const png = (name: string) => new File([new Uint8Array(PNG)], name, { type: 'image/png' });

function json(status: number, body: unknown): Response {
  return new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
}

const chooseInput = () => screen.getByLabelText('Choose pictures') as HTMLInputElement;
const cameraInput = () => screen.getByLabelText('Take a photo') as HTMLInputElement;
const pick = (input: HTMLInputElement, files: File[]) => fireEvent.change(input, { target: { files } });

function fillRequired() {
  fireEvent.change(screen.getByRole('textbox', { name: 'Title' }), { target: { value: created.title } });
  fireEvent.change(screen.getByRole('textbox', { name: 'Where on the aircraft' }), { target: { value: created.location } });
  fireEvent.click(screen.getByRole('radio', { name: /Airworthiness/ }));
  fireEvent.change(screen.getByRole('textbox', { name: 'What was seen' }), { target: { value: created.seen } });
}

describe('raising a finding with photos', () => {
  const fetchMock = vi.fn<typeof fetch>();
  let made: string[];
  let revoked: string[];

  beforeEach(() => {
    vi.stubGlobal('fetch', fetchMock);
    // These answer through fetch; the progress path (XMLHttpRequest) has its own test.
    vi.stubGlobal('XMLHttpRequest', undefined);
    document.cookie = 'ws_csrf=tok-9';
    made = [];
    revoked = [];
    vi.spyOn(URL, 'createObjectURL').mockImplementation((b) => {
      const u = `blob:preview/${(b as File).name}/${made.length}`;
      made.push(u);
      return u;
    });
    vi.spyOn(URL, 'revokeObjectURL').mockImplementation((u) => void revoked.push(u));
  });
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
    document.cookie = 'ws_csrf=; expires=Thu, 01 Jan 1970 00:00:00 GMT';
  });

  function renderForm() {
    const onRaised = vi.fn<(o: RaiseOutcome) => void>();
    const view = renderWithApp(<RaiseFinding jobId={JOB} workshop={workshop} onCancel={() => {}} onRaised={onRaised} />);
    return { ...view, onRaised };
  }

  it('offers the camera and the picture chooser as two inputs that take only pictures', () => {
    renderForm();
    expect(cameraInput().getAttribute('capture')).toBe('environment');
    expect(cameraInput().multiple).toBe(false);
    expect(chooseInput().hasAttribute('capture')).toBe(false);
    expect(chooseInput().multiple).toBe(true);
    for (const input of [cameraInput(), chooseInput()]) expect(input.accept).toBe('image/jpeg,image/png,image/webp');
  });

  it('when pictures are chosen, then each shows a preview, and removing one revokes its preview URL', async () => {
    const { unmount } = renderForm();
    pick(chooseInput(), [jpeg('plug-1.jpg'), png('cowl.png')]);
    const chosen = await screen.findByRole('list', { name: 'Chosen photos' });
    await waitFor(() => expect(within(chosen).getAllByRole('img')).toHaveLength(2));
    const [first, second] = within(chosen).getAllByRole('img') as HTMLImageElement[];
    expect(first!.alt).toBe('Chosen photo 1: plug-1.jpg');
    expect(first!.getAttribute('src')).toMatch(/^blob:preview\/plug-1\.jpg\//);
    expect(second!.alt).toBe('Chosen photo 2: cowl.png');

    const plugUrl = first!.getAttribute('src')!;
    fireEvent.click(screen.getByRole('button', { name: 'Remove chosen photo 1 (plug-1.jpg)' }));
    await waitFor(() => expect(within(chosen).getAllByRole('img')).toHaveLength(1));
    expect(revoked).toContain(plugUrl);
    expect(within(chosen).getByRole('img').getAttribute('alt')).toBe('Chosen photo 1: cowl.png');

    // Leaving the form revokes what is still shown.
    const cowlUrl = within(chosen).getByRole('img').getAttribute('src')!;
    unmount();
    expect(revoked).toContain(cowlUrl);
    expect(made.filter((u) => !revoked.includes(u))).toEqual([]);
  });

  it('when a file is too large or is not a picture inside, then it is refused by name and the rest are kept', async () => {
    renderForm();
    const big = jpeg('hangar-wide.jpg');
    Object.defineProperty(big, 'size', { value: PHOTO_LIMITS.maxBytes + 1 });
    const renamed = new File(['torque figures for the prop bolts'], 'notes.jpg', { type: 'image/jpeg' });
    pick(chooseInput(), [big, renamed, jpeg('ok.jpg')]);
    const alert = await screen.findByRole('alert');
    expect(alert.textContent).toContain('2 files were not added');
    expect(alert.textContent).toContain('hangar-wide.jpg is 15.1 MB; a photo can be at most 15 MB.');
    expect(alert.textContent).toContain('notes.jpg is not a JPEG, PNG or WebP picture, so it cannot be attached.');
    const chosen = await screen.findByRole('list', { name: 'Chosen photos' });
    expect(within(chosen).getAllByRole('listitem').map((li) => li.getAttribute('data-chosen-photo'))).toEqual(['ok.jpg']);
  });

  it('when more photos are chosen than one upload carries, then the extra ones are left out with the limit', async () => {
    renderForm();
    const many = Array.from({ length: PHOTO_LIMITS.maxFilesPerUpload + 2 }, (_, i) => jpeg(`p${i + 1}.jpg`));
    pick(chooseInput(), many);
    const alert = await screen.findByRole('alert');
    expect(alert.textContent).toContain(`p7.jpg, p8.jpg left out: only ${PHOTO_LIMITS.maxFilesPerUpload} more photos fit here`);
    expect(within(screen.getByRole('list', { name: 'Chosen photos' })).getAllByRole('listitem')).toHaveLength(PHOTO_LIMITS.maxFilesPerUpload);
    // Full: both ways of adding are switched off.
    expect(chooseInput().disabled).toBe(true);
    expect(cameraInput().disabled).toBe(true);
  });

  it('when raised, then the finding is created first and the photos are uploaded to it after', async () => {
    const { onRaised } = renderForm();
    fillRequired();
    pick(cameraInput(), [jpeg('spring.jpg')]);
    await screen.findByRole('list', { name: 'Chosen photos' });
    fetchMock.mockImplementation(async (url) => {
      if (String(url) === `/api/jobs/${JOB}/findings`) return json(201, created);
      if (String(url) === `/api/jobs/${JOB}/findings/${created.id}/photos`) return json(201, [{ id: 'p1', findingId: created.id }]);
      return json(200, []);
    });
    fireEvent.click(screen.getByRole('button', { name: 'Raise finding' }));
    await waitFor(() => expect(onRaised).toHaveBeenCalledOnce());
    const writes = fetchMock.mock.calls.filter(([, init]) => init?.method === 'POST');
    expect(writes.map(([u]) => u)).toEqual([`/api/jobs/${JOB}/findings`, `/api/jobs/${JOB}/findings/${created.id}/photos`]);
    expect(JSON.parse(String(writes[0]![1]!.body))).toMatchObject({ title: created.title, category: 'airworthiness' });
    const form = writes[1]![1]!.body as FormData;
    expect((form.getAll('photos') as File[]).map((f) => f.name)).toEqual(['spring.jpg']);
    const outcome = onRaised.mock.calls[0]![0];
    expect(outcome).toMatchObject({ finding: { id: created.id }, photosAttached: 1, unsent: null });
    expect(describeRaise(outcome).text).toBe('F-3 “Cracked exhaust spring” is with the manager to price, with 1 photo.');
  });

  it('when the finding is refused, then no photo is sent and the chosen photos stay in the form', async () => {
    const { onRaised } = renderForm();
    fillRequired();
    pick(chooseInput(), [jpeg('spring.jpg')]);
    await screen.findByRole('list', { name: 'Chosen photos' });
    fetchMock.mockResolvedValueOnce(json(409, { error: { code: 'invalid_transition', message: 'This job is not open for findings.' } }));
    fireEvent.click(screen.getByRole('button', { name: 'Raise finding' }));
    expect(await screen.findByText('This job is not open for findings.')).toBeTruthy();
    expect(fetchMock).toHaveBeenCalledOnce();
    expect(onRaised).not.toHaveBeenCalled();
    expect(within(screen.getByRole('list', { name: 'Chosen photos' })).getAllByRole('listitem')).toHaveLength(1);
  });

  it('when the upload fails, then the finding is reported saved, the server says why, and the photos come back for another try', async () => {
    const { onRaised } = renderForm();
    fillRequired();
    pick(chooseInput(), [jpeg('spring.jpg'), jpeg('hook.jpg')]);
    await waitFor(() => expect(within(screen.getByRole('list', { name: 'Chosen photos' })).getAllByRole('listitem')).toHaveLength(2));
    fetchMock.mockImplementation(async (url) => {
      if (String(url) === `/api/jobs/${JOB}/findings`) return json(201, created);
      if (String(url).endsWith('/photos')) return json(413, { error: { code: 'too_large', message: 'hook.jpg is larger than 15 MB.' } });
      return json(200, []);
    });
    fireEvent.click(screen.getByRole('button', { name: 'Raise finding' }));
    await waitFor(() => expect(onRaised).toHaveBeenCalledOnce());
    const outcome = onRaised.mock.calls[0]![0];
    expect(outcome.finding.id).toBe(created.id);
    expect(outcome.photosAttached).toBe(0);
    expect(outcome.unsent?.message).toBe('hook.jpg is larger than 15 MB.');
    expect(outcome.unsent?.files.map((f) => f.name)).toEqual(['spring.jpg', 'hook.jpg']);
    const words = describeRaise(outcome);
    expect(words.problem).toBe(true);
    expect(words.title).toBe('Finding saved; photos not attached');
    expect(words.text).toBe(
      'F-3 “Cracked exhaust spring” is saved and is with the manager to price, but its 2 photos were not attached: hook.jpg is larger than 15 MB. Nothing you typed is lost. Try the photos again from F-3\'s card.',
    );
  });
});

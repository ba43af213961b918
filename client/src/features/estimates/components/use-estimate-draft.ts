import {
  estimateEngineInput,
  estimateLargeFigures,
  estimateLineSchema,
  estimateSaveSchema,
  type LargeFigure,
  priceEstimate,
  type AccessTaskDto,
  type EstimateDto,
  type EstimateLineDto,
  type PricedEstimate,
  type WorkshopPricing,
} from '@wingstage/shared';
import { useQueryClient } from '@tanstack/react-query';
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { isApiError } from '@/lib/api-client';
import { jobKeysBase } from '@/lib/job-keys';
import { estimateKeys } from '../api/keys';
import { getEstimate } from '../api/get-estimate';
import { saveEstimate } from '../api/save-estimate';

export interface Draft {
  lines: EstimateLineDto[];
  accessTasks: AccessTaskDto[];
  /** The version these edits started from; the save sends it so a concurrent save is caught. */
  baseVersion: number;
  dirty: boolean;
}

export interface Conflict {
  /** The version someone else saved. */
  theirVersion: number;
  /** Their estimate as it now stands on the server, once fetched. */
  theirs: EstimateDto | null;
}

export type Live = { ok: true; priced: PricedEstimate } | { ok: false; priced: PricedEstimate | null; problem: string };

export function newId(): string {
  const c: Crypto = globalThis.crypto;
  // randomUUID exists only in secure contexts; a v4-shaped id from getRandomValues elsewhere.
  if (typeof c.randomUUID === 'function') return c.randomUUID();
  const b = c.getRandomValues(new Uint8Array(16));
  b[6] = (b[6]! & 0x0f) | 0x40;
  b[8] = (b[8]! & 0x3f) | 0x80;
  const h = Array.from(b, (x) => x.toString(16).padStart(2, '0')).join('');
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`;
}

const fromServer = (e: EstimateDto): Draft => ({ lines: e.lines, accessTasks: e.accessTasks, baseVersion: e.version, dirty: false });

const FIGURES = new Set(['quantity', 'ratePerHour', 'unitCost', 'unitPrice', 'markupPercent', 'amount', 'discountPercent']);

/**
 * Why the totals cannot be worked out, in the person's words: the first line whose figure the
 * shared schema refuses, named by its description. The engine's own messages name fields by their
 * place in its input (`lines[1].quantity`), which is for programmers, not for the manager.
 */
export function figureProblem(lines: readonly EstimateLineDto[]): string {
  for (const l of lines) {
    if (!EDITABLE_STAGES.has(l.stage)) continue;
    const checked = estimateLineSchema.safeParse(l);
    const issue = checked.success ? undefined : checked.error.issues.find((i) => FIGURES.has(String(i.path[0])));
    if (issue) return `"${l.description || 'A new line'}": ${issue.message}`;
  }
  return 'a figure on one of the lines is not a number yet.';
}

/** Only these stages are the manager's to change; approved and declined lines are the owner's decisions. */
export const EDITABLE_STAGES = new Set(['inspection', 'discovered']);

/**
 * The estimate being edited: the loaded lines plus unsaved changes, priced live by the shared
 * engine on every change, and saved with the version it started from.
 */
export function useEstimateDraft(jobId: string, estimate: EstimateDto, pricing: WorkshopPricing) {
  const qc = useQueryClient();
  const [draft, setDraft] = useState<Draft>(() => fromServer(estimate));
  const [conflict, setConflict] = useState<Conflict | null>(null);
  const [saving, setSaving] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const [lineErrors, setLineErrors] = useState<Record<string, string>>({});
  const [savedAt, setSavedAt] = useState<number | null>(null);
  /** Figures larger than a light-aircraft job usually needs, waiting for the person to confirm them. */
  const [large, setLarge] = useState<LargeFigure[] | null>(null);

  // A newer version from the server replaces the view only when nothing here is unsaved;
  // otherwise the manager's lines stay and the save will say what happened.
  useEffect(() => {
    setDraft((d) => (d.dirty || d.baseVersion === estimate.version ? d : fromServer(estimate)));
  }, [estimate]);

  const lastGood = useRef<PricedEstimate | null>(null);
  const live: Live = useMemo(() => {
    try {
      const priced = priceEstimate(estimateEngineInput(draft.lines, draft.accessTasks), pricing);
      lastGood.current = priced;
      return { ok: true, priced };
    } catch {
      return { ok: false, priced: lastGood.current, problem: figureProblem(draft.lines) };
    }
  }, [draft.lines, draft.accessTasks, pricing]);

  const change = useCallback((fn: (d: Draft) => Pick<Draft, 'lines' | 'accessTasks'>) => {
    setSavedAt(null);
    setDraft((d) => ({ ...d, ...fn(d), dirty: true }));
  }, []);

  const updateLine = useCallback(
    (id: string, patch: Partial<EstimateLineDto>) => change((d) => ({ lines: d.lines.map((l) => (l.id === id ? { ...l, ...patch } : l)), accessTasks: d.accessTasks })),
    [change],
  );
  const addLines = useCallback((lines: EstimateLineDto[], tasks: AccessTaskDto[] = []) => change((d) => ({ lines: [...d.lines, ...lines], accessTasks: [...d.accessTasks, ...tasks] })), [change]);
  const removeLine = useCallback((id: string) => change((d) => ({ lines: d.lines.filter((l) => l.id !== id), accessTasks: d.accessTasks })), [change]);
  const updateTask = useCallback(
    (id: string, patch: Partial<AccessTaskDto>) => change((d) => ({ lines: d.lines, accessTasks: d.accessTasks.map((t) => (t.id === id ? { ...t, ...patch } : t)) })),
    [change],
  );
  const removeTask = useCallback(
    (id: string) =>
      change((d) => ({
        // Lines that named the task keep their work but no longer share its opening-up.
        lines: d.lines.map((l) => (l.accessTaskId === id ? { ...l, accessTaskId: null } : l)),
        accessTasks: d.accessTasks.filter((t) => t.id !== id),
      })),
    [change],
  );

  const discard = useCallback(
    (to: EstimateDto) => {
      setConflict(null);
      setProblem(null);
      setLineErrors({});
      setDraft(fromServer(to));
      qc.setQueryData(estimateKeys.detail(jobId), to);
    },
    [jobId, qc],
  );

  const save = useCallback(
    async (opts: { over?: number; confirmLarge?: boolean } = {}) => {
      setProblem(null);
      setLineErrors({});
      setLarge(null);
      const version = opts.over ?? draft.baseVersion;
      const confirmLarge = opts.confirmLarge ?? false;
      const body = { version, lines: draft.lines.filter((l) => EDITABLE_STAGES.has(l.stage)), accessTasks: draft.accessTasks, confirmLarge };
      const parsed = estimateSaveSchema.safeParse(body);
      if (!parsed.success) {
        const onlyLarge = parsed.error.issues.every((i) => i.path[0] === 'confirmLarge');
        if (onlyLarge) {
          // Nothing is wrong, only large: ask, and save when the person confirms.
          setLarge(estimateLargeFigures(body));
          return false;
        }
        const errs: Record<string, string> = {};
        for (const issue of parsed.error.issues) {
          const [where, index] = issue.path;
          const item = where === 'lines' ? body.lines[Number(index)] : where === 'accessTasks' ? body.accessTasks[Number(index)] : undefined;
          if (item && !errs[item.id]) errs[item.id] = issue.message;
        }
        setLineErrors(errs);
        setProblem('Some lines need attention before the estimate can be saved.');
        return false;
      }
      setSaving(true);
      try {
        const saved = await saveEstimate(jobId, parsed.data);
        setConflict(null);
        setDraft(fromServer(saved));
        setSavedAt(Date.now());
        qc.setQueryData(estimateKeys.detail(jobId), saved);
        // Saving moves findings between draft and priced, and writes the job's history.
        await qc.invalidateQueries({ queryKey: jobKeysBase.detail(jobId), predicate: (q) => q.queryKey[3] !== 'estimate' });
        return true;
      } catch (e) {
        if (isApiError(e) && e.code === 'stale_version') {
          const theirVersion = Number(e.fields.version ?? NaN);
          setConflict({ theirVersion: Number.isFinite(theirVersion) ? theirVersion : version + 1, theirs: null });
          // Fetch their version to show beside ours, without touching the lines being edited.
          try {
            const theirs = await getEstimate(jobId);
            setConflict({ theirVersion: theirs.version, theirs });
          } catch {
            // The notice still says what happened; the figures are just not shown.
          }
          return false;
        }
        if (isApiError(e) && e.fields.confirmLarge) {
          setLarge(estimateLargeFigures(body));
          return false;
        }
        if (isApiError(e) && Object.keys(e.fields).length > 0) {
          const errs: Record<string, string> = {};
          for (const [path, message] of Object.entries(e.fields)) {
            const m = /^(lines|accessTasks)\.(\d+)/.exec(path);
            const item = m ? (m[1] === 'lines' ? body.lines : body.accessTasks)[Number(m[2])] : undefined;
            if (item) errs[item.id] = message;
          }
          setLineErrors(errs);
        }
        setProblem(isApiError(e) ? e.message : 'The estimate could not be saved. Please try again.');
        return false;
      } finally {
        setSaving(false);
      }
    },
    [draft, jobId, qc],
  );

  return { draft, live, conflict, saving, problem, lineErrors, savedAt, large, dismissLarge: () => setLarge(null), updateLine, addLines, removeLine, updateTask, removeTask, discard, save };
}

export type EstimateDraftApi = ReturnType<typeof useEstimateDraft>;

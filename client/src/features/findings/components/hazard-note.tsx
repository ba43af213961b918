import { HandStopIcon } from '@/components/ui/icons';
import { HANGAR_WORDS } from '../words';

/**
 * A caution beside the work it belongs to (propeller live, fuel, engine runs). Its look is its
 * own: a raised hand and the word "Caution" on a sunk panel with a heavy edge, so it reads neither
 * as an airworthiness finding nor as an error.
 */
export function HazardNote({ text, about }: { text: string; about?: string }) {
  return (
    <div data-caution className="mt-1 flex items-start gap-2 rounded-control border-l-4 border-slate-deep bg-cloth-sunk px-3 py-2 text-sm text-slate">
      <span className="mt-0.5 shrink-0">
        <HandStopIcon size={18} />
      </span>
      <p>
        <span className="font-semibold">{HANGAR_WORDS.caution}</span>
        {about ? <span className="font-semibold"> · {about}</span> : null}: {text}
      </p>
    </div>
  );
}

import { cautionsFor, type Hazard, type HazardCaution } from '@shared/safety/hazards';
import { cn } from '@/lib/cn';

interface HazardCautionsProps {
  /** Hazards to caution about (the texts come from shared/safety/hazards.ts), or cautions an answer carried. */
  hazards?: Iterable<Hazard>;
  cautions?: HazardCaution[];
  /** The note's accessible name; "Lifting caution" when lifting is all it says. */
  label?: string;
  /** A line above the list saying which step this is for ("Before you start on the bench"). */
  intro?: string;
  className?: string;
  id?: string;
  /** For lists (My bench): the hazards by name, their texts one tap away. */
  compact?: boolean;
}

/**
 * The one caution box of Benchrelay: beside the move that starts the work, on My bench, at intake and
 * hand-back, on transfers and in the pad map's glue step. Each text defers to the safety data sheet, local
 * codes and licensed practice, or for lifting to manual-handling rules and local codes.
 */
export function HazardCautions({ hazards, cautions, label, intro, className, id, compact = false }: HazardCautionsProps) {
  const list = cautions ?? cautionsFor(hazards ?? []);
  if (list.length === 0) return null;
  const liftingOnly = list.every((c) => c.hazard === 'heavy_lift');
  return (
    <div
      id={id}
      role="note"
      aria-label={label ?? (liftingOnly ? 'Lifting caution' : 'Safety cautions')}
      className={cn('flex gap-3 rounded-xl border-2 border-[#b7791f] bg-[#fff8e6] p-3 text-sm text-ink-950', className)}
      data-safety
    >
      <svg className="mt-0.5 size-5 shrink-0 text-[#8a5300]" viewBox="0 0 20 20" fill="none" aria-hidden="true">
        <path d="M10 2.5 18.5 17h-17L10 2.5Z" stroke="currentColor" strokeWidth="1.8" strokeLinejoin="round" />
        <path d="M10 8v4.2M10 14.4v.1" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
      </svg>
      <div className="min-w-0">
        {intro ? <p className="font-bold">{intro}</p> : null}
        {compact ? (
          <details>
            <summary className="cursor-pointer font-semibold">
              Safety: {list.map((c) => c.title.replace(/ \(.*\)$/, '')).join('; ')}
            </summary>
            <CautionList list={list} className="mt-1" />
          </details>
        ) : (
          <CautionList list={list} className={intro ? 'mt-1' : ''} />
        )}
      </div>
    </div>
  );
}

function CautionList({ list, className }: { list: HazardCaution[]; className?: string }) {
  return (
    <ul className={cn('space-y-1.5', className)}>
      {list.map((c) => (
        <li key={c.hazard} data-hazard={c.hazard}>
          <strong>{c.title}.</strong> {c.text}
        </li>
      ))}
    </ul>
  );
}


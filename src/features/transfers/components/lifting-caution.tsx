import { LIFTING_CAUTION } from '@shared/transfers';

/** Shown wherever a heavy case is about to be lifted: packing, handing over, receiving. */
export function LiftingCaution() {
  return (
    <div role="note" aria-label="Lifting caution" className="flex gap-3 rounded-xl border border-amber-300 bg-amber-50 p-4 text-amber-950">
      <svg className="mt-0.5 size-5 shrink-0" viewBox="0 0 20 20" fill="none" aria-hidden="true">
        <path d="M10 2.5 18.5 17h-17L10 2.5Z" stroke="currentColor" strokeWidth="1.6" strokeLinejoin="round" />
        <path d="M10 8v4" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
        <circle cx="10" cy="14.5" r="1" fill="currentColor" />
      </svg>
      <div>
        <p className="font-semibold">Heavy case: two people or a cart</p>
        <p className="mt-1 text-sm">{LIFTING_CAUTION}</p>
      </div>
    </div>
  );
}

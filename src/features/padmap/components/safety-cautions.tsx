import { cn } from '@/lib/cn';

/**
 * The usual cautions for the repad's hazardous steps. Benchrelay is not the authority here: the
 * product's safety data sheet, local codes and licensed practice are, and the text says so.
 */
export const PAD_SAFETY_CAUTIONS: Array<{ title: string; text: string }> = [
  {
    title: 'Cyanoacrylate adhesive',
    text: 'Bonds skin and eyelids in seconds and its vapour irritates eyes and airways: ventilate the bench, wear eye protection and nitrile gloves, keep the nozzle away from your face, and keep debonder at hand.',
  },
  {
    title: 'Debonders and solvents',
    text: 'Flammable, and they strip lacquer: keep them off the finish and away from flame or a hot heat gun, cap them after use, and ventilate.',
  },
  {
    title: 'Heat or flame for glued pads',
    text: 'Fire and burn risk, and heat scorches lacquer and pads: work on a heat-proof surface, let keys cool before handling, keep the flame away from solvents and rags, and have an extinguisher within reach.',
  },
  {
    title: 'Abrasive discs on rotary tools',
    text: 'Fragments fly when a disc catches: wear eye protection and keep guards in place.',
  },
];

export const SAFETY_DEFERRAL =
  'These are the usual cautions only. Follow the product’s safety data sheet, local codes and licensed practice; they come first.';

export function SafetyCautions({ className, headingLevel = 'h3' }: { className?: string; headingLevel?: 'h2' | 'h3' }) {
  const Heading = headingLevel;
  return (
    <aside
      aria-label="Safety cautions"
      className={cn('rounded-xl border-2 border-[#b7791f] bg-[#fff8e6] p-4 text-sm text-ink-950', className)}
      data-safety
    >
      <Heading className="flex items-center gap-2 text-base font-bold">
        <svg className="size-5 shrink-0 text-[#8a5300]" viewBox="0 0 20 20" fill="none" aria-hidden="true">
          <path d="M10 2.5 18.5 17h-17L10 2.5Z" stroke="currentColor" strokeWidth="1.8" strokeLinejoin="round" />
          <path d="M10 8v4.2M10 14.4v.1" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
        </svg>
        Safety: adhesives, solvents, heat
      </Heading>
      <ul className="mt-2 space-y-1.5">
        {PAD_SAFETY_CAUTIONS.map((c) => (
          <li key={c.title}>
            <strong>{c.title}.</strong> {c.text}
          </li>
        ))}
      </ul>
      <p className="mt-2 font-semibold">{SAFETY_DEFERRAL}</p>
    </aside>
  );
}

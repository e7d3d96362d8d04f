import { useId, useMemo, useState } from 'react';
import type { AttachmentDto } from '@shared/jobs/dto';
import { Button } from '@/components/ui/button';
import { controlClasses } from '@/components/ui/form-controls';
import { formatDate, viewerTimeZone } from '@shared/time/format';
import { cn } from '@/lib/cn';

const describe = (a: AttachmentDto) =>
  [a.jobNumber ? `Job ${a.jobNumber}` : null, a.caption, formatDate(a.createdAt, viewerTimeZone())].filter(Boolean).join(' · ');

/**
 * Before and after of the same instrument: a slider over the two photos (the range input is the
 * control, so it works by keyboard and by thumb), or the two side by side.
 */
export function BeforeAfter({ photos, title = 'Before and after' }: { photos: AttachmentDto[]; title?: string }) {
  const befores = useMemo(() => photos.filter((p) => p.tag === 'before' && p.url), [photos]);
  const afters = useMemo(() => photos.filter((p) => p.tag === 'after' && p.url), [photos]);
  const [beforeId, setBeforeId] = useState<string>();
  const [afterId, setAfterId] = useState<string>();
  const [position, setPosition] = useState(50);
  const [sideBySide, setSideBySide] = useState(false);
  const sliderId = useId();

  const before = befores.find((p) => p.id === beforeId) ?? befores[befores.length - 1];
  const after = afters.find((p) => p.id === afterId) ?? afters[afters.length - 1];
  if (!before || !after) {
    return (
      <p className="rounded-xl bg-paper-50 p-4 text-sm text-ink-600">
        The comparison appears once there is a <strong>before</strong> and an <strong>after</strong> photo.
      </p>
    );
  }

  return (
    <figure aria-label={title} className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h3 className="font-semibold text-ink-950">{title}</h3>
        <Button variant="secondary" aria-pressed={sideBySide} onClick={() => setSideBySide((v) => !v)}>
          {sideBySide ? 'Slider' : 'Side by side'}
        </Button>
      </div>
      {sideBySide ? (
        <div className="grid grid-cols-2 gap-2">
          {[before, after].map((p) => (
            <div key={p.id} className="flex flex-col gap-1">
              <img src={p.url!} alt={`${p.tag === 'before' ? 'Before' : 'After'}: ${p.caption ?? 'photo'}`} className="aspect-[4/3] w-full rounded-lg bg-ink-950 object-contain" />
              <span className="text-xs font-semibold text-ink-800">{p.tag === 'before' ? 'Before' : 'After'}</span>
            </div>
          ))}
        </div>
      ) : (
        <>
          <div className="relative aspect-[4/3] w-full overflow-hidden rounded-xl bg-ink-950 select-none">
            <img src={before.url!} alt={`Before: ${before.caption ?? 'photo'}`} className="absolute inset-0 size-full object-contain" draggable={false} />
            <img
              src={after.url!}
              alt={`After: ${after.caption ?? 'photo'}`}
              className="absolute inset-0 size-full object-contain"
              style={{ clipPath: `inset(0 0 0 ${position}%)` }}
              draggable={false}
            />
            <div className="pointer-events-none absolute inset-y-0 w-0.5 bg-white shadow" style={{ left: `${position}%` }} aria-hidden="true" />
            <span className="absolute top-2 left-2 rounded bg-ink-950/70 px-2 py-0.5 text-xs font-semibold text-white">Before</span>
            <span className="absolute top-2 right-2 rounded bg-ink-950/70 px-2 py-0.5 text-xs font-semibold text-white">After</span>
          </div>
          <label htmlFor={sliderId} className="sr-only">
            Slide between before and after
          </label>
          <input
            id={sliderId}
            type="range"
            min={0}
            max={100}
            value={position}
            onChange={(e) => setPosition(Number(e.target.value))}
            className="h-11 w-full accent-accent-600"
            aria-valuetext={`${100 - position} % after`}
          />
        </>
      )}
      <figcaption className="text-sm text-ink-600">
        Before: {describe(before)}. After: {describe(after)}.
      </figcaption>
      {befores.length > 1 || afters.length > 1 ? (
        <div className="grid gap-2 sm:grid-cols-2">
          <label className="flex flex-col gap-1 text-sm font-semibold text-ink-800">
            Before photo
            <select className={controlClasses} value={before.id} onChange={(e) => setBeforeId(e.target.value)}>
              {befores.map((p) => (
                <option key={p.id} value={p.id}>
                  {describe(p)}
                </option>
              ))}
            </select>
          </label>
          <label className={cn('flex flex-col gap-1 text-sm font-semibold text-ink-800')}>
            After photo
            <select className={controlClasses} value={after.id} onChange={(e) => setAfterId(e.target.value)}>
              {afters.map((p) => (
                <option key={p.id} value={p.id}>
                  {describe(p)}
                </option>
              ))}
            </select>
          </label>
        </div>
      ) : null}
    </figure>
  );
}

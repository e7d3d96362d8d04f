import { useId, useState, type ReactNode } from 'react';
import { Card } from '@/components/ui/card';
import { Button } from '@/components/ui/button';
import { cn } from '@/lib/cn';

interface ChartFigureProps {
  title: string;
  description?: ReactNode;
  /** The drawing. Hidden from assistive technology: the table is the accessible version. */
  chart: ReactNode;
  /** The same numbers as a table, with the links behind them. */
  table: ReactNode;
  /** Controls shown beside the title (a window picker, a link to the list). */
  actions?: ReactNode;
  className?: string;
}

/**
 * A chart with its table fallback. Screen readers always get the table (visually hidden while the chart
 * shows); anyone may switch to the table to read exact numbers or follow its links by keyboard.
 */
export function ChartFigure({ title, description, chart, table, actions, className }: ChartFigureProps) {
  const [showTable, setShowTable] = useState(false);
  const headingId = useId();
  const regionId = useId();
  return (
    <Card as="section" aria-labelledby={headingId} className={cn('flex flex-col gap-4', className)}>
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div className="min-w-0">
          <h2 id={headingId} className="text-lg font-semibold text-ink-950">
            {title}
          </h2>
          {description ? <p className="mt-1 text-sm text-ink-600">{description}</p> : null}
        </div>
        <div className="flex flex-wrap items-center gap-2">
          {actions}
          <Button variant="secondary" aria-controls={regionId} onClick={() => setShowTable((v) => !v)}>
            {showTable ? 'Show chart' : 'Show table'}
          </Button>
        </div>
      </div>
      <div id={regionId}>
        {showTable ? null : (
          <div aria-hidden="true" className="w-full">
            {chart}
          </div>
        )}
        <div className={showTable ? 'overflow-x-auto' : 'sr-only'}>{table}</div>
      </div>
    </Card>
  );
}

/** The table style every figure uses. */
export function FigureTable({ caption, children, className }: { caption: string; children: ReactNode; className?: string }) {
  return (
    <table className={cn('w-full text-left text-sm', className)}>
      <caption className="sr-only">{caption}</caption>
      {children}
    </table>
  );
}

export const th = 'px-3 py-2 font-semibold text-ink-600';
export const td = 'px-3 py-2 text-ink-800';
export const tdNum = 'px-3 py-2 text-right tabular-nums text-ink-950';
export const figureLink = 'font-semibold text-accent-700 underline decoration-accent-200 underline-offset-2 hover:decoration-accent-700';

import { INSTRUMENT_FAMILY_LABELS, JOB_STAGE_LABELS, type InstrumentFamily, type JobStage } from '@shared/domain';
import { formatCalendarDate } from '@shared/time/calendar-date';
import { formatDateTime } from '@shared/time/format';

export const stageLabel = (stage: JobStage) => JOB_STAGE_LABELS[stage] ?? stage;
export const familyLabel = (family: InstrumentFamily | null | undefined) => (family ? INSTRUMENT_FAMILY_LABELS[family] : 'Any family');

/** "1 h 30 min", "45 min". */
export function formatMinutes(minutes: number): string {
  const h = Math.floor(minutes / 60);
  const m = minutes % 60;
  if (!h) return `${m} min`;
  return m ? `${h} h ${m} min` : `${h} h`;
}

/** A moment shown on the shop's clock, e.g. "Mon 9 Mar 2026, 14:05 PDT" (shared/time/format.ts). */
export function formatInShop(iso: string, timeZone: string): string {
  return formatDateTime(iso, timeZone);
}

export const formatPromise = (date: string | null) => (date ? formatCalendarDate(date) : 'No promise yet');

/**
 * Why a typed hours or quantity box is not an amount: letters first ("two" is not a number), then
 * too many decimals. Undefined when the text is empty or fine.
 */
export function amountProblem(text: string, example = '1.25'): string | undefined {
  const t = text.trim();
  if (!t) return undefined;
  if (!/^\d*[.,]?\d*$/.test(t) || !/\d/.test(t)) return `Enter a number, e.g. ${example}.`;
  if (!/^\d+([.,]\d{1,2})?$|^[.,]\d{1,2}$/.test(t)) return `At most two decimals, e.g. ${example}.`;
  return undefined;
}

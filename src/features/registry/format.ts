import { INSTRUMENT_FAMILY_LABELS, JOB_STAGE_LABELS, type InstrumentFamily, type JobStage } from '@shared/domain';
import { INSTRUMENT_STATUS_LABELS, type InstrumentStatus } from '@shared/schemas/registry';
import { formatCalendarDate, formatDateTime, viewerTimeZone } from '@shared/time/format';

export const familyLabel = (family: InstrumentFamily) => INSTRUMENT_FAMILY_LABELS[family] ?? family;
export const stageLabel = (stage: JobStage) => JOB_STAGE_LABELS[stage] ?? stage.replace(/_/g, ' ');
export const statusLabel = (status: InstrumentStatus) => INSTRUMENT_STATUS_LABELS[status] ?? status;

/** A moment shown in the viewer's shop clock, with the zone's short name so nobody misreads another shop's time. */
export function formatInZone(iso: string, timeZone: string | undefined): string {
  try {
    return formatDateTime(iso, timeZone ?? viewerTimeZone());
  } catch {
    return formatDateTime(iso, 'UTC');
  }
}

/** A calendar date ('YYYY-MM-DD') as words, without shifting it through a time zone. */
export const formatDay = (day: string): string => formatCalendarDate(day);

/** Today as 'YYYY-MM-DD' in a time zone: the earliest promise a shop can make (shared/time/shop-calendar.ts). */
export { todayIn } from '@shared/time/shop-calendar';

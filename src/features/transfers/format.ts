import { INSTRUMENT_FAMILY_LABELS, type InstrumentFamily, type TransferState } from '@shared/domain';
import { formatCalendarDate, formatDate, formatDateTime } from '@shared/time/format';

/** Date and time in a shop's zone, with the zone said, because two shops of a transfer may differ. */
export function formatInShop(iso: string | null | undefined, timeZone: string, withTime = true): string {
  return withTime ? formatDateTime(iso, timeZone) : formatDate(iso, timeZone);
}

/** 'YYYY-MM-DD' (a local calendar date) → "Tue 18 Jun 2026". */
export const formatLocalDate = formatCalendarDate;

export function describeInstrument(i: { family: InstrumentFamily; maker: string; model: string | null }): string {
  return `${INSTRUMENT_FAMILY_LABELS[i.family]} · ${[i.maker, i.model].filter(Boolean).join(' ')}`;
}

/** Badge colours by how far along a transfer is; the label always says the state in words. */
export const STATE_TONE: Record<TransferState, string> = {
  requested: 'bg-paper-200 text-ink-950',
  approved: 'bg-accent-50 text-accent-800',
  packed: 'bg-accent-100 text-accent-800',
  in_transit: 'bg-accent-600 text-white',
  received: 'bg-accent-800 text-white',
  rejected: 'bg-danger-50 text-danger-700',
  cancelled: 'bg-paper-100 text-ink-600 line-through decoration-1',
};

/** What each queued step is called while the worker is on it. */
export const PENDING_LABEL: Record<TransferState, string> = {
  requested: 'Recording the request…',
  approved: 'Recording the approval…',
  rejected: 'Recording the rejection…',
  cancelled: 'Cancelling…',
  packed: 'Recording the packing and printing the manifest…',
  in_transit: 'Handing over to the relay run…',
  received: 'Receiving and moving the job…',
};

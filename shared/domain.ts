/**
 * Benchrelay's vocabulary, shared by client and server. Stored values are the snake_case keys;
 * screens show the labels.
 */
export const ROLES = ['owner', 'regional_manager', 'front_desk', 'technician', 'auditor'] as const;
export type Role = (typeof ROLES)[number];
export const ROLE_LABELS: Record<Role, string> = {
  owner: 'Owner',
  regional_manager: 'Regional manager',
  front_desk: 'Front desk',
  technician: 'Technician',
  auditor: 'Auditor',
};

/** Main line of a job, in order. */
export const JOB_STAGES = ['intake', 'assessed', 'approved', 'on_bench', 'quality_check', 'ready', 'released'] as const;
/** Holds a job can sit in between main stages. */
export const JOB_HOLDS = ['waiting_for_parts', 'in_transit'] as const;
export const ALL_JOB_STAGES = [...JOB_STAGES, ...JOB_HOLDS] as const;
export type JobStage = (typeof ALL_JOB_STAGES)[number];
export const JOB_STAGE_LABELS: Record<JobStage, string> = {
  intake: 'Intake',
  assessed: 'Assessed',
  approved: 'Approved',
  on_bench: 'On bench',
  quality_check: 'Quality check',
  ready: 'Ready',
  released: 'Released',
  waiting_for_parts: 'Waiting for parts',
  in_transit: 'In transit',
};
/** Every stage but released counts as open work. */
export const OPEN_JOB_STAGES: JobStage[] = ALL_JOB_STAGES.filter((s) => s !== 'released');

export const INSTRUMENT_FAMILIES = [
  'alto_saxophone', 'tenor_saxophone', 'baritone_saxophone', 'bass_saxophone', 'soprano_saxophone',
  'flute', 'piccolo', 'clarinet', 'bass_clarinet', 'oboe', 'bassoon',
  'trumpet', 'trombone', 'french_horn', 'euphonium', 'tuba', 'other',
] as const;
export type InstrumentFamily = (typeof INSTRUMENT_FAMILIES)[number];
export const INSTRUMENT_FAMILY_LABELS: Record<InstrumentFamily, string> = {
  alto_saxophone: 'Alto saxophone', tenor_saxophone: 'Tenor saxophone', baritone_saxophone: 'Baritone saxophone', bass_saxophone: 'Bass saxophone',
  soprano_saxophone: 'Soprano saxophone', flute: 'Flute', piccolo: 'Piccolo', clarinet: 'Clarinet',
  bass_clarinet: 'Bass clarinet', oboe: 'Oboe', bassoon: 'Bassoon', trumpet: 'Trumpet', trombone: 'Trombone',
  french_horn: 'French horn', euphonium: 'Euphonium', tuba: 'Tuba', other: 'Other',
};

export const OWNER_KINDS = ['customer', 'school', 'rental_fleet'] as const;
export type OwnerKind = (typeof OWNER_KINDS)[number];

export const TRANSFER_STATES = ['requested', 'approved', 'packed', 'in_transit', 'received', 'rejected', 'cancelled'] as const;
export type TransferState = (typeof TRANSFER_STATES)[number];

export const NOTIFICATION_KINDS = [
  'transfer_incoming', 'transfer_overdue', 'job_ready', 'estimate_awaiting_approval',
  'invitation_accepted', 'stock_shortage',
] as const;
export type NotificationKind = (typeof NOTIFICATION_KINDS)[number];

/** What each kind of notice is called on the inbox and preferences screens, and who it is for. */
export const NOTIFICATION_KIND_LABELS: Record<NotificationKind, { label: string; description: string }> = {
  transfer_incoming: { label: 'Transfers', description: 'A transfer to or from your shop was requested, approved, packed, sent, received or stopped.' },
  transfer_overdue: { label: 'Overdue transfers', description: 'An instrument on the road has not arrived by its expected date.' },
  job_ready: { label: 'Jobs ready', description: 'A job at your front desk passed its final check and can be collected.' },
  estimate_awaiting_approval: { label: 'Estimates awaiting approval', description: 'An estimate went to the customer and waits for their answer.' },
  invitation_accepted: { label: 'Invitations accepted', description: 'Someone you invited has joined the network.' },
  stock_shortage: { label: 'Stock shortages', description: 'A job reserved more of a part than your shop has on the shelf.' },
};

/**
 * Whether a kind also goes out by e-mail until the person chooses otherwise: the kinds that ask someone
 * to act soon (something is arriving or late, someone joined, a part is short) do; the everyday
 * front-desk notices (many a day) stay in the inbox unless the person turns their e-mail on.
 */
export const NOTIFICATION_EMAIL_DEFAULTS: Record<NotificationKind, boolean> = {
  transfer_incoming: true,
  transfer_overdue: true,
  job_ready: false,
  estimate_awaiting_approval: false,
  invitation_accepted: true,
  stock_shortage: true,
};

/** ISO weekday numbers, Monday = 1 … Sunday = 7 (as date-fns `getISODay`). */
export type IsoWeekday = 1 | 2 | 3 | 4 | 5 | 6 | 7;

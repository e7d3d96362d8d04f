import type { NotificationKind } from './domain.js';

/** The inbox API's answers, read by the server (which returns them) and the client (which shows them). */

/** `Time` is `string` on the wire (ISO 8601) and `Date` where the server builds the answer. */
export interface Notice<Time = string> {
  id: string;
  kind: NotificationKind;
  title: string;
  body: string;
  /** In-app path of the thing the notice is about (a job, a transfer, the stock screen). */
  link: string | null;
  readAt: Time | null;
  createdAt: Time;
}

export interface Inbox<Time = string> {
  notifications: Array<Notice<Time>>;
  unread: number;
  total: number;
}

export interface NotificationChoice {
  kind: NotificationKind;
  email: boolean;
  /** False when the person never chose and the default applies. */
  chosen: boolean;
  defaultEmail: boolean;
}

export interface NotificationPreferences {
  /** Where the e-mails go. */
  email: string;
  preferences: NotificationChoice[];
}

import type { NotificationKind } from '@shared/domain';

export interface Notice {
  id: string;
  kind: NotificationKind;
  title: string;
  body: string;
  /** In-app path of the thing the notice is about (a job, a transfer, the stock screen). */
  link: string | null;
  readAt: string | null;
  createdAt: string;
}

export interface Inbox {
  notifications: Notice[];
  unread: number;
  total: number;
}

export interface NotificationChoice {
  kind: NotificationKind;
  email: boolean;
  chosen: boolean;
  defaultEmail: boolean;
}

export interface NotificationPreferences {
  email: string;
  preferences: NotificationChoice[];
}

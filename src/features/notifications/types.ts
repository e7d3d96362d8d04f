export type { Inbox, Notice, NotificationChoice, NotificationPreferences } from '@shared/notifications';

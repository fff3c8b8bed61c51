// The states of one reminder e-mail in a campaign's outbox, with no zod, so status marks can
// import them without the schemas.
export const REMINDER_SEND_STATUSES = ['pending', 'sending', 'sent', 'failed', 'suppressed', 'cancelled'] as const;
export type ReminderSendStatus = (typeof REMINDER_SEND_STATUSES)[number];

/** One word per outbox state, the same in the campaign's log and on the household's page. */
export const REMINDER_SEND_STATUS_LABELS: Record<ReminderSendStatus, string> = {
  pending: 'Queued',
  sending: 'Sending',
  sent: 'Sent',
  failed: 'Failed',
  suppressed: 'Unsubscribed',
  cancelled: 'Cancelled',
};

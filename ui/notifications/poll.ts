/** Default time between two reads of the unread notification count while a page is open. */
export const UNREAD_POLL_MS = 30_000;

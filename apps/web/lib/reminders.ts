// The reminder screen's choices, free of zod, so that the page in the browser can use them.

/** The "Due within" choices of the reminder screen, in weeks. */
export const REMINDER_WEEKS = [2, 4, 6, 8, 12, 26] as const;

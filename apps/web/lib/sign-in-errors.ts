// What the sign-in page shows for next-auth's `?error=`: shared by the server that throws it and
// the form that reads it. One message for every refused sign-in, so none tells whether an account
// exists; a throttled one also says how long to wait.

const THROTTLED = 'TooManyAttempts:';

/** The error text `authorize` throws when sign-in is blocked for `seconds`. */
export const throttledError = (seconds: number) => `${THROTTLED}${Math.max(1, Math.ceil(seconds))}`;

export const WRONG_CREDENTIALS = 'That e-mail and password do not match an active account.';

function wait(seconds: number): string {
  const minutes = Math.ceil(seconds / 60);
  if (minutes <= 1) return 'a minute';
  if (minutes < 120) return `${minutes} minutes`;
  return `${Math.ceil(minutes / 60)} hours`;
}

/** The message for an `?error=` value, or null when there is none. */
export function signInErrorMessage(error: string | null | undefined): string | null {
  if (!error) return null;
  if (error.startsWith(THROTTLED)) {
    const seconds = Number(error.slice(THROTTLED.length));
    if (Number.isFinite(seconds) && seconds > 0) {
      return `Too many failed sign-ins. Wait ${wait(seconds)}, then try again.`;
    }
  }
  return WRONG_CREDENTIALS;
}

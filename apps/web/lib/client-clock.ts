// The browser's view of the app's clock (apps/web/server/clock.ts): the signed-in shell hands
// down the server's "now" once per page load, and the browser keeps the difference from its own
// clock, so timers, "late" and "days past" agree with the server's figures, whatever the
// device's clock says and whatever REELWRIGHT_NOW pins.
let offsetMs = 0;

export function syncWithServer(serverNow: string) {
  const at = Date.parse(serverNow);
  if (!Number.isNaN(at)) offsetMs = at - Date.now();
}

/** Milliseconds since the epoch on the app's clock. */
export function clientNow(): number {
  return Date.now() + offsetMs;
}

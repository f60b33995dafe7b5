'use client';

import { useState } from 'react';
import { syncWithServer } from '~/lib/client-clock';

/** Renders nothing: sets the browser's clock offset from the server's "now", once. */
export function ServerClock({ now }: { now: string }) {
  useState(() => syncWithServer(now));
  return null;
}

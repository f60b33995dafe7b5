'use client';

import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { useState, type ReactNode } from 'react';
import { config } from 'zod/v4/core';

// The pages' CSP forbids eval: zod would otherwise probe for it with Function('') (a reported
// violation). The core's config is the one every zod schema reads, without zod's whole API.
config({ jitless: true });

export function Providers({ children }: { children: ReactNode }) {
  const [client] = useState(
    () => new QueryClient({ defaultOptions: { queries: { staleTime: 30_000, retry: 1 } } }),
  );
  return <QueryClientProvider client={client}>{children}</QueryClientProvider>;
}

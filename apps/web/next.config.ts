import type { NextConfig } from 'next';
import { API_CONTENT_SECURITY_POLICY, STATIC_SECURITY_HEADERS } from './lib/security-headers';

const config: NextConfig = {
  // Separate build folders let several checkouts' servers run side by side (set NEXT_DIST_DIR per checkout).
  distDir: process.env.NEXT_DIST_DIR || '.next',
  transpilePackages: ['@reelwright/db', '@reelwright/metrics'],
  // PGlite ships an 8.7 MB wasm that must stay on the server, not under /_next/static.
  serverExternalPackages: ['@electric-sql/pglite', '@node-rs/argon2', 'pg'],
  poweredByHeader: false,
  typedRoutes: false,
  // Pages get their CSP (with a per-request nonce) and HSTS from proxy.ts, API routes HSTS from route().
  async headers() {
    return [
      { source: '/:path*', headers: [...STATIC_SECURITY_HEADERS] },
      {
        source: '/api/:path*',
        headers: [{ key: 'Content-Security-Policy', value: API_CONTENT_SECURITY_POLICY }],
      },
    ];
  },
};

export default config;

import type { NextConfig } from 'next';

const config: NextConfig = {
  // Separate build folders let several checkouts' servers run side by side (set NEXT_DIST_DIR per checkout).
  distDir: process.env.NEXT_DIST_DIR || '.next',
  transpilePackages: ['@reelwright/db', '@reelwright/metrics'],
  // PGlite ships an 8.7 MB wasm that must stay on the server, not under /_next/static.
  serverExternalPackages: ['@electric-sql/pglite', '@node-rs/argon2', 'pg'],
  poweredByHeader: false,
  typedRoutes: false,
};

export default config;

// Security headers, kept free of imports so that next.config.ts can read them too.

/** Sent with every response, pages, API and static files alike (next.config.ts). */
export const STATIC_SECURITY_HEADERS: readonly { key: string; value: string }[] = [
  { key: 'X-Content-Type-Options', value: 'nosniff' },
  { key: 'Referrer-Policy', value: 'strict-origin-when-cross-origin' },
  {
    key: 'Permissions-Policy',
    value:
      'camera=(), microphone=(), geolocation=(), payment=(), usb=(), serial=(), bluetooth=(), ' +
      'magnetometer=(), gyroscope=(), accelerometer=(), display-capture=(), browsing-topics=()',
  },
  // For browsers that predate CSP's frame-ancestors.
  { key: 'X-Frame-Options', value: 'DENY' },
];

/**
 * API answers are data, never documents: nothing in them may load, run or be framed, and one
 * opened as a page (a photo, say) runs sandboxed, as an opaque origin without scripts.
 * next.config.ts puts it on every /api response, replacing whatever a route set.
 */
export const API_CONTENT_SECURITY_POLICY = "default-src 'none'; frame-ancestors 'none'; sandbox";

/**
 * The pages' policy. Scripts run only with this response's nonce (Next puts it on its own
 * scripts) or when loaded by such a script; styles may be inline because the charts and
 * Tremor's components set style attributes in server-rendered HTML, which a nonce cannot cover.
 * Photos and their uploads go to object storage, which is another origin.
 */
export function pageContentSecurityPolicy(options: {
  nonce: string;
  storageOrigins: readonly string[];
  https: boolean;
  development: boolean;
}): string {
  const storage = options.storageOrigins.join(' ');
  const directives = [
    "default-src 'self'",
    `script-src 'self' 'nonce-${options.nonce}' 'strict-dynamic'${options.development ? " 'unsafe-eval'" : ''}`,
    "style-src 'self' 'unsafe-inline'",
    `img-src 'self' data: blob: ${storage}`.trim(),
    "font-src 'self'",
    `connect-src 'self' ${storage}`.trim(),
    "object-src 'none'",
    "base-uri 'none'",
    "form-action 'self'",
    "frame-ancestors 'none'",
    ...(options.https ? ['upgrade-insecure-requests'] : []),
  ];
  return directives.join('; ');
}

/** Two years with subdomains, as hstspreload.org asks; only ever sent when served over https. */
export const HSTS_VALUE = 'max-age=63072000; includeSubDomains';

import { env } from '~/env';
import { HSTS_VALUE, pageContentSecurityPolicy } from '~/lib/security-headers';

const publicUrl = () => env.APP_BASE_URL ?? env.NEXTAUTH_URL;

/** HSTS only when the public address is https: on plain http a browser ignores it anyway. */
export function strictTransportSecurity(): string | null {
  return publicUrl()?.startsWith('https://') ? HSTS_VALUE : null;
}

/**
 * Where photos are shown from and uploaded to: the configured endpoint (the local fake, MinIO),
 * or the bucket's AWS hosts, virtual-hosted and path-style.
 */
export function storageOrigins(): string[] {
  if (env.S3_ENDPOINT) return [new URL(env.S3_ENDPOINT).origin];
  return [
    `https://${env.S3_BUCKET}.s3.${env.S3_REGION}.amazonaws.com`,
    `https://s3.${env.S3_REGION}.amazonaws.com`,
  ];
}

export function pagePolicy(nonce: string): string {
  return pageContentSecurityPolicy({
    nonce,
    storageOrigins: storageOrigins(),
    https: Boolean(publicUrl()?.startsWith('https://')),
    development: env.NODE_ENV === 'development',
  });
}

import type { Metadata, Viewport } from 'next';
import localFont from 'next/font/local';
import { connection } from 'next/server';
import type { ReactNode } from 'react';
import { Providers } from './providers';
import './globals.css';

// Inter ships with the app (SIL Open Font License, see fonts/Inter-LICENSE.txt): no font CDN.
const inter = localFont({
  src: './fonts/InterVariable-latin.woff2',
  variable: '--font-inter',
  display: 'swap',
  weight: '100 900',
});

export const metadata: Metadata = {
  title: { default: 'Reelwright', template: '%s · Reelwright' },
  description: 'Operations and quality for a network of fishing-reel service shops.',
};

export const viewport: Viewport = { themeColor: '#1f514a' };

export default async function RootLayout({ children }: { children: ReactNode }) {
  // Every page renders per request, so that its scripts carry this request's CSP nonce (proxy.ts).
  await connection();
  return (
    <html lang="en" className={inter.variable}>
      <body className="min-h-screen font-sans">
        <Providers>{children}</Providers>
      </body>
    </html>
  );
}

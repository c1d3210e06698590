import type { Metadata } from 'next';
import localFont from 'next/font/local';
import type { ReactNode } from 'react';
import { SafetyFooter } from '@/components/safety-footer';
import { Providers } from './providers';
import './globals.css';

// Inter (SIL Open Font License 1.1, see app/fonts/OFL-1.1.txt), shipped in the repo: no fetch at build.
const inter = localFont({
  src: './fonts/inter-latin-wght-normal.woff2',
  variable: '--font-inter',
  weight: '100 900',
  display: 'swap',
});

export const metadata: Metadata = {
  title: { default: 'Kilorung', template: '%s · Kilorung' },
  description: 'Design, check and share diode–capacitor ladder multipliers for high-voltage DC supplies, with your team.',
};

export default function RootLayout({ children }: { children: ReactNode }) {
  return (
    <html lang="en" className={inter.variable}>
      <body className="flex min-h-screen flex-col bg-ink-900 font-sans text-ink-100 antialiased">
        <a
          href="#main"
          className="sr-only focus:not-sr-only focus:absolute focus:left-3 focus:top-3 focus:z-50 focus:rounded focus:bg-ink-50 focus:px-3 focus:py-2 focus:text-ink-900"
        >
          Skip to content
        </a>
        <Providers>
          <div className="flex flex-1 flex-col">{children}</div>
        </Providers>
        <SafetyFooter />
      </body>
    </html>
  );
}

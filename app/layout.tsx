import type { Metadata } from 'next';
import type { ReactNode } from 'react';
import '@fontsource/merriweather-sans/latin-400.css';
import '@fontsource/merriweather-sans/latin-700.css';
import '@fontsource/merriweather-sans/latin-ext-400.css';
import '@fontsource/merriweather-sans/latin-ext-700.css';
import './globals.css';
import { Providers } from './providers';

export const metadata: Metadata = {
  title: { default: 'Countersample', template: '%s · Countersample' },
  description: 'Case files for contested freezing-point results of raw milk deliveries.',
};

export default function RootLayout({ children }: { children: ReactNode }) {
  return (
    <html lang="en-GB">
      <body>
        <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-ink focus:px-3 focus:py-2 focus:text-paper">
          Skip to content
        </a>
        <Providers>{children}</Providers>
      </body>
    </html>
  );
}

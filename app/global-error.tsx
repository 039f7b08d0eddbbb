'use client';

export default function GlobalError({ reset }: { error: Error; reset: () => void }) {
  return (
    <html lang="en-GB">
      <body style={{ fontFamily: 'sans-serif', padding: 32 }}>
        <h1>Countersample could not load this page</h1>
        <p>Something went wrong on our side. Nothing was changed by this failure.</p>
        <button onClick={reset}>Try again</button>
      </body>
    </html>
  );
}

"use client";

/** Last-resort page when the root layout itself fails; it must bring its own html and body. */
export default function GlobalError({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <html lang="en">
      <body style={{ fontFamily: "system-ui, sans-serif", background: "#f7f5f0", color: "#1b2330", padding: "3rem 1rem" }}>
        <main style={{ maxWidth: 480, margin: "0 auto" }}>
          <h1>Proofbay is having trouble</h1>
          <p>Something failed on our side. Nothing you entered was lost.</p>
          <button type="button" onClick={reset}>
            Try again
          </button>
        </main>
      </body>
    </html>
  );
}

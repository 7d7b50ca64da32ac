"use client";

export default function GlobalError({ reset }: { error: Error; reset: () => void }) {
  return (
    <html lang="en">
      <body style={{ fontFamily: "system-ui", background: "#faf7f2", color: "#1f2328", padding: "4rem 1rem", textAlign: "center" }}>
        <h1>Grainward hit a problem</h1>
        <p>Please reload the page.</p>
        <button type="button" onClick={reset} style={{ minHeight: 44, padding: "0 1rem" }}>Reload</button>
      </body>
    </html>
  );
}

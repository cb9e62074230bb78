"use client";

export default function ErrorPage({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <main className="mx-auto max-w-md px-6 py-16">
      <h1 className="mb-2">Something went wrong</h1>
      <p className="mb-4 text-sm text-ink-muted">
        The error has been logged. Your data was not changed by the step that failed.
      </p>
      <button className="btn-quiet" onClick={reset}>
        Try again
      </button>
    </main>
  );
}

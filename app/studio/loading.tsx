export default function Loading() {
  return (
    <div role="status" aria-live="polite" className="mx-auto flex max-w-md items-center justify-center gap-3 px-4 py-20 text-muted">
      <span className="size-4 animate-spin rounded-full border-2 border-resin border-t-transparent" />
      Loading…
    </div>
  );
}

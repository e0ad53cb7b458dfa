/** Fills the frame while a page's code is first fetched, so the header and navigation show at once. */
export function PageLoading() {
  return <p className="text-lg text-ink-soft">Loading this page…</p>;
}

export default function Loading() {
  return <p role="status">Loading the review queue…</p>;
}

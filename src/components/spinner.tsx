export function Spinner({ label = 'Loading…' }: { label?: string }) {
  return (
    <div className="flex items-center gap-3 py-8 text-walnut-500" role="status">
      <span className="h-5 w-5 animate-spin rounded-full border-2 border-amber-400 border-r-transparent" aria-hidden />
      <span>{label}</span>
    </div>
  );
}

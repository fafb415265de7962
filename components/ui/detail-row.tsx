/** One label/value row of a record's description list (`<dl>`); empty values show an em dash. */
export function DetailRow({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div className="grid grid-cols-3 gap-2 border-t border-line py-2 first:border-0">
      <dt className="text-sm text-muted">{label}</dt>
      <dd className="col-span-2 text-sm">{children ?? "—"}</dd>
    </div>
  );
}

import { cn } from "@/lib/utils";

export const inputClass =
  "block w-full rounded-md border border-line bg-white px-3 py-2 text-sm text-ink shadow-sm placeholder:text-muted/70 focus:border-brand focus:outline-none aria-[invalid=true]:border-danger";

/** Label + control + error message, wired for screen readers. */
export function Field({ label, htmlFor, error, hint, children, className }: { label: string; htmlFor: string; error?: string[] | string; hint?: string; children: React.ReactNode; className?: string }) {
  const msg = Array.isArray(error) ? error.join(" ") : error;
  return (
    <div className={cn("space-y-1", className)}>
      <label htmlFor={htmlFor} className="block text-sm font-medium text-ink">
        {label}
      </label>
      {children}
      {hint && !msg && <p className="text-xs text-muted">{hint}</p>}
      {msg && (
        <p id={`${htmlFor}-error`} className="text-xs font-medium text-danger" role="alert">
          {msg}
        </p>
      )}
    </div>
  );
}

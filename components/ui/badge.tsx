import { cn } from "@/lib/utils";

type Tone = "neutral" | "brand" | "oxide" | "ok" | "danger";
const TONES: Record<Tone, string> = {
  neutral: "bg-stone text-muted border-line",
  brand: "bg-brand-light text-brand-dark border-brand/20",
  oxide: "bg-oxide-light text-oxide border-oxide/30",
  ok: "bg-green-50 text-ok border-ok/30",
  danger: "bg-red-50 text-danger border-danger/30",
};

export function Badge({ tone = "neutral", children, className }: { tone?: Tone; children: React.ReactNode; className?: string }) {
  return <span className={cn("inline-flex items-center rounded-full border px-2 py-0.5 text-xs font-medium", TONES[tone], className)}>{children}</span>;
}

import { cn } from "@/lib/utils";

type Variant = "primary" | "secondary" | "danger" | "ghost";
const VARIANTS: Record<Variant, string> = {
  primary: "bg-brand text-white hover:bg-brand-dark disabled:bg-brand/50",
  secondary: "border border-line bg-white text-ink hover:bg-stone disabled:text-muted",
  danger: "bg-danger text-white hover:bg-danger/90",
  ghost: "text-brand hover:bg-brand-light",
};

export function buttonClass(variant: Variant = "primary", extra?: string) {
  return cn("inline-flex items-center justify-center gap-2 rounded-md px-3.5 py-2 text-sm font-medium transition-colors disabled:cursor-not-allowed", VARIANTS[variant], extra);
}

export function Button({ variant = "primary", className, ...props }: React.ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant }) {
  return <button className={buttonClass(variant, className)} {...props} />;
}

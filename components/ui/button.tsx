import type { ButtonHTMLAttributes, AnchorHTMLAttributes } from "react";

type Variant = "primary" | "secondary" | "danger" | "ghost";
type Size = "md" | "lg" | "sm";

const base =
  "inline-flex items-center justify-center gap-2 rounded-md font-semibold transition-colors disabled:cursor-not-allowed disabled:opacity-60 focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-estuary-600 no-underline hover:no-underline";
const variants: Record<Variant, string> = {
  primary: "bg-estuary-700 text-white hover:bg-estuary-800",
  secondary: "border border-ink-200 bg-white text-ink-900 hover:bg-ink-50",
  danger: "bg-fail-600 text-white hover:bg-fail-700",
  ghost: "text-estuary-700 hover:bg-estuary-50",
};
// "lg" is the field size: at least 48 px tall for gloved fingers on a phone.
const sizes: Record<Size, string> = { sm: "px-3 py-1.5 text-sm", md: "px-4 py-2 text-base", lg: "min-h-12 px-5 py-3 text-lg" };

export function buttonClass(variant: Variant = "primary", size: Size = "md", extra = ""): string {
  return `${base} ${variants[variant]} ${sizes[size]} ${extra}`.trim();
}

export function Button({ variant = "primary", size = "md", className = "", type = "button", ...rest }: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant; size?: Size }) {
  return <button type={type} className={buttonClass(variant, size, className)} {...rest} />;
}

export function ButtonLink({ variant = "primary", size = "md", className = "", ...rest }: AnchorHTMLAttributes<HTMLAnchorElement> & { variant?: Variant; size?: Size }) {
  return <a className={buttonClass(variant, size, className)} {...rest} />;
}

// Button styles, usable from server and client components alike.
export type Variant = "primary" | "secondary" | "danger" | "quiet";

const variants: Record<Variant, string> = {
  primary: "bg-shallows text-white hover:bg-river focus-visible:outline-shallows",
  secondary: "border border-shallows text-shallows bg-white hover:bg-shallows-pale focus-visible:outline-shallows",
  danger: "border border-ember text-ember bg-white hover:bg-ember hover:text-white focus-visible:outline-ember",
  quiet: "text-shallows underline-offset-2 hover:underline focus-visible:outline-shallows",
};

export function buttonClass(variant: Variant = "primary", extra = "") {
  return `inline-flex items-center justify-center gap-2 rounded-md px-4 py-2 text-sm font-medium transition-colors focus-visible:outline-2 focus-visible:outline-offset-2 disabled:cursor-not-allowed disabled:opacity-60 ${variants[variant]} ${extra}`;
}

/** A link in running text or a table: underlined, so colour is not what tells it apart. */
export const textLinkClass = "text-shallows underline underline-offset-2 hover:text-river";

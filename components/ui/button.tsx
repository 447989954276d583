import Link from "next/link";
import type { ComponentProps } from "react";

const VARIANTS = {
  primary: "bg-tide-600 text-white hover:bg-tide-700 disabled:bg-tide-200",
  quiet: "bg-white text-tide-700 ring-1 ring-tide-200 hover:bg-tide-50",
  danger: "bg-white text-flag-rose ring-1 ring-flag-rose/40 hover:bg-flag-roseBg",
} as const;

const BASE = "inline-flex items-center justify-center gap-2 rounded-lg px-4 py-2 text-sm font-semibold transition disabled:cursor-not-allowed";

export function Button({ variant = "primary", className = "", ...props }: ComponentProps<"button"> & { variant?: keyof typeof VARIANTS }) {
  return <button className={`${BASE} ${VARIANTS[variant]} ${className}`} {...props} />;
}

export function ButtonLink({ variant = "primary", className = "", ...props }: ComponentProps<typeof Link> & { variant?: keyof typeof VARIANTS }) {
  return <Link className={`${BASE} ${VARIANTS[variant]} ${className}`} {...props} />;
}

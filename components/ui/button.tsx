import { cva, type VariantProps } from "class-variance-authority";
import type { ButtonHTMLAttributes } from "react";
import { cn } from "@/lib/utils";

export const buttonVariants = cva(
  "inline-flex items-center justify-center gap-1.5 rounded-md border text-sm font-medium transition-colors disabled:cursor-not-allowed disabled:opacity-50",
  {
    variants: {
      variant: {
        primary: "border-copper bg-copper text-white hover:bg-copper-dark",
        secondary: "border-rule-strong bg-paper-raised text-ink hover:bg-paper-sunk",
        ghost: "border-transparent bg-transparent text-ink-soft hover:bg-paper-sunk hover:text-ink",
        danger: "border-verdict-fail bg-paper-raised text-verdict-fail hover:bg-verdict-failBg",
      },
      size: { sm: "h-8 px-2.5", md: "h-9 px-3.5", lg: "h-11 px-5 text-base" },
    },
    defaultVariants: { variant: "primary", size: "md" },
  },
);

export interface ButtonProps extends ButtonHTMLAttributes<HTMLButtonElement>, VariantProps<typeof buttonVariants> {}

export function Button({ className, variant, size, type = "button", ...props }: ButtonProps) {
  return <button type={type} className={cn(buttonVariants({ variant, size }), className)} {...props} />;
}

import type { Metadata, Viewport } from "next";
import type { ReactNode } from "react";
import { inter, mono } from "@/fonts";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Tankbook", template: "%s · Tankbook" },
  description: "The bench logbook for LC oscillator builds: every capture analysed, every tweak traced.",
};

export const viewport: Viewport = { width: "device-width", initialScale: 1, themeColor: "#f6f4ef" };

export default function RootLayout({ children }: { children: ReactNode }) {
  return (
    <html lang="en" className={`${inter.variable} ${mono.variable}`}>
      <body className="flex min-h-screen flex-col">{children}</body>
    </html>
  );
}

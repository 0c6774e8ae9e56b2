import localFont from "next/font/local";

// Shipped with the app (OFL-1.1, licences beside the files) so no font is fetched at build or run time.
export const inter = localFont({
  src: [
    { path: "./inter-latin-wght-normal.woff2", style: "normal", weight: "100 900" },
    { path: "./inter-latin-wght-italic.woff2", style: "italic", weight: "100 900" },
  ],
  variable: "--font-inter",
  display: "swap",
});

export const mono = localFont({
  src: [{ path: "./jetbrains-mono-latin-wght-normal.woff2", style: "normal", weight: "100 800" }],
  variable: "--font-mono",
  display: "swap",
  adjustFontFallback: false,
});

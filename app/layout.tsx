import type { Metadata, Viewport } from "next";
import localFont from "next/font/local";
import { Providers } from "@/components/providers";
import "./globals.css";

// Shipped with the app from the fontsource package: no font is fetched from the internet.
const body = localFont({
  src: "../node_modules/@fontsource-variable/inter/files/inter-latin-wght-normal.woff2",
  variable: "--font-body",
  display: "swap",
});

export const metadata: Metadata = {
  title: { default: "Kinarc", template: "%s · Kinarc" },
  description: "Wrist and finger range and strength checks for hand therapy, in the clinic and by video.",
};

export const viewport: Viewport = { width: "device-width", initialScale: 1, themeColor: "#155952" };

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en" className={body.variable}>
      <body className="min-h-screen font-sans">
        <Providers>{children}</Providers>
      </body>
    </html>
  );
}

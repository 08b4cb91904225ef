import type { Metadata } from "next";
import { sans, mono } from "@/fonts";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Papin", template: "%s · Papin" },
  description: "Steam-sterilizer test cycles checked against the saturated-steam line, signed and archived.",
};

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en" className={`${sans.variable} ${mono.variable}`}>
      <body className="min-h-screen">{children}</body>
    </html>
  );
}

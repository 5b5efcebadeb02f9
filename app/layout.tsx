import type { Metadata } from "next";
import type { ReactNode } from "react";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Tributary", template: "%s · Tributary" },
  description: "Plan marketing budgets on approved regression fits, with honest intervals.",
};

export default function RootLayout({ children }: { children: ReactNode }) {
  return (
    <html lang="en">
      <body className="min-h-screen bg-silt font-sans text-slate-800 antialiased">{children}</body>
    </html>
  );
}

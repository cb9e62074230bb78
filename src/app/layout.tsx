import type { Metadata } from "next";
// Inter ships with the app (fontsource files, every subset including Greek for α and µ);
// nothing is fetched at build or run time.
import "@fontsource-variable/inter";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Inhibitrack", template: "%s · Inhibitrack" },
  description: "Enzyme-inhibitor screening campaigns: plates, QC, dose-response, mechanism and Ki, triage.",
  icons: { icon: "/favicon.svg" },
};

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en" style={{ ["--font-sans" as string]: "'Inter Variable'" }}>
      <body className="min-h-screen font-sans">{children}</body>
    </html>
  );
}

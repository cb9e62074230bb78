"use client";
import Link from "next/link";
import { usePathname } from "next/navigation";

const items = [
  { href: "", label: "Overview" },
  { href: "/compounds", label: "Compounds", global: true },
  { href: "/plates", label: "Plates" },
  { href: "/analyses", label: "Analyses" },
  { href: "/hits", label: "Hits" },
  { href: "/digest", label: "Weekly digest" },
  { href: "/team", label: "Team & settings" },
];

export function CampaignNav({ campaignId }: { campaignId: string }) {
  const path = usePathname();
  const base = `/campaigns/${campaignId}`;
  return (
    <nav className="flex flex-col gap-0.5 text-sm" aria-label="Campaign">
      {items.map((i) => {
        const href = i.global ? `/compounds?campaign=${campaignId}` : `${base}${i.href}`;
        const active = i.global
          ? path.startsWith("/compounds")
          : i.href === ""
            ? path === base
            : path.startsWith(`${base}${i.href}`);
        return (
          <Link
            key={i.label}
            href={href}
            aria-current={active ? "page" : undefined}
            className={`rounded px-2 py-1 ${active ? "bg-paper-raised font-medium text-ink shadow-card" : "text-ink-soft hover:bg-paper-raised hover:text-ink"}`}
          >
            {i.label}
          </Link>
        );
      })}
    </nav>
  );
}

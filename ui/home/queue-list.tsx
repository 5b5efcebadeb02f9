import Link from "next/link";
import type { ReactNode } from "react";
import { textLinkClass } from "@/ui/button-class";

export type QueueItem = {
  key: string;
  href: string;
  title: string;
  /** The small line under the title (what it is, whose). */
  detail: ReactNode;
  /** Right-hand side: a state badge or a date. */
  aside: ReactNode;
  /** data-* attributes for tests and tooling, e.g. { "data-testid": "home-awaiting", "data-fit": id }. */
  data?: Record<`data-${string}`, string>;
};

/** The home page's work queues: one linked line per item, a detail under it and its state on the right. */
export function QueueList({ items, empty }: { items: QueueItem[]; empty: string }) {
  if (items.length === 0) return <p className="text-sm text-slate-700">{empty}</p>;
  return (
    <ul className="flex flex-col divide-y divide-slate-100 text-sm">
      {items.map((item) => (
        <li key={item.key} className="flex flex-wrap items-center justify-between gap-3 py-2" {...item.data}>
          <span className="flex flex-col">
            <Link href={item.href} className={textLinkClass}>
              {item.title}
            </Link>
            <span className="text-xs text-slate-600">{item.detail}</span>
          </span>
          {item.aside}
        </li>
      ))}
    </ul>
  );
}

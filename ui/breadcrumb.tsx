import Link from "next/link";
import { Fragment } from "react";
import { textLinkClass } from "@/ui/button-class";

/** The way back above a page's title: "Spend histories / Larkspur weekly history", each part a link. */
export function Breadcrumb({ trail }: { trail: { href: string; label: string }[] }) {
  return (
    <nav aria-label="Breadcrumb" className="text-sm">
      {trail.map((step, index) => (
        <Fragment key={step.href}>
          {index > 0 ? " / " : null}
          <Link href={step.href} className={textLinkClass}>
            {step.label}
          </Link>
        </Fragment>
      ))}
    </nav>
  );
}

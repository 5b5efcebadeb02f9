import type { ReactNode } from "react";

/** A titled panel on the silt page background. */
export function Section({ title, description, actions, children, id }: { title: string; description?: ReactNode; actions?: ReactNode; children: ReactNode; id?: string }) {
  const headingId = id ? `${id}-heading` : undefined;
  return (
    <section aria-labelledby={headingId} id={id} className="rounded-lg border border-slate-200 bg-white p-5 shadow-sm">
      <div className="mb-4 flex flex-wrap items-start justify-between gap-3">
        <div>
          <h2 id={headingId} className="text-lg font-semibold text-river">
            {title}
          </h2>
          {description ? <p className="mt-1 text-sm text-slate-600">{description}</p> : null}
        </div>
        {actions}
      </div>
      {children}
    </section>
  );
}

export function PageHeading({ title, children }: { title: string; children?: ReactNode }) {
  return (
    <div className="mb-6">
      <h1 className="text-2xl font-semibold text-river">{title}</h1>
      {children ? <div className="mt-1 text-slate-700">{children}</div> : null}
    </div>
  );
}

export function RoleBadge({ children }: { children: ReactNode }) {
  return <span className="inline-flex items-center rounded-full bg-shallows-pale px-2.5 py-0.5 text-xs font-medium text-river">{children}</span>;
}

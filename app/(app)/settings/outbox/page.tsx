import Link from "next/link";
import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { requirePageActor } from "@/server/authz";
import { isLocalMailSink } from "@/server/mail/transport";
import { listLocalMail } from "@/server/mail/outbox";
import { PageHeading, Section } from "@/ui/section";
import { textLinkClass } from "@/ui/button-class";

export const metadata: Metadata = { title: "Local mail outbox" };

/** Exists only when the app runs with the local mail sink (MAIL_SINK=local); 404 otherwise. */
export default async function OutboxPage() {
  if (!isLocalMailSink()) notFound();
  const actor = await requirePageActor("mail:outbox");
  const messages = await listLocalMail(100);
  const date = new Intl.DateTimeFormat(actor.locale, { dateStyle: "medium", timeStyle: "medium", timeZone: "UTC" });
  return (
    <div className="flex flex-col gap-6">
      <PageHeading title="Local mail outbox">
        <p>
          This copy of Tributary delivers no e-mail: the local sink keeps every message here instead (newest first).{" "}
          <Link href="/settings" className={textLinkClass}>Back to settings</Link>
        </p>
      </PageHeading>
      <Section id="messages" title={`${messages.length} message${messages.length === 1 ? "" : "s"}`}>
        {messages.length === 0 ? (
          <p className="text-sm text-slate-700">No messages yet. Invitations and notifications will appear here.</p>
        ) : (
          <ul className="flex flex-col divide-y divide-slate-100">
            {messages.map((message) => (
              <li key={message.id} className="py-3">
                <details>
                  <summary className="cursor-pointer">
                    <span className="font-medium">{message.subject || "(no subject)"}</span>
                    <span className="block text-sm text-slate-600">
                      to {message.to.join(", ")} · from {message.from || "(none)"} · <span className="num">{date.format(message.receivedAt)} UTC</span>
                    </span>
                  </summary>
                  <pre className="mt-2 overflow-x-auto whitespace-pre-wrap break-all rounded bg-silt p-3 font-mono text-xs text-slate-800">{message.text}</pre>
                </details>
              </li>
            ))}
          </ul>
        )}
      </Section>
    </div>
  );
}

import Link from "next/link";
import type { Metadata } from "next";
import { requirePageActor } from "@/server/authz";
import { listApiTokensByUser } from "@/server/data/api-tokens";
import { PageHeading, Section } from "@/ui/section";
import { CreateTokenForm, RevokeTokenButton } from "./token-forms";
import { textLinkClass } from "@/ui/button-class";

export const metadata: Metadata = { title: "API tokens" };

export default async function TokensPage() {
  const actor = await requirePageActor("token:manage");
  const tokens = await listApiTokensByUser({ workspaceId: actor.workspaceId, userId: actor.userId });
  const date = new Intl.DateTimeFormat(actor.locale, { dateStyle: "medium", timeStyle: "short", timeZone: "UTC" });
  const now = Date.now();
  const stateOf = (token: (typeof tokens)[number]) =>
    token.revokedAt ? "Revoked" : token.expiresAt && token.expiresAt.getTime() <= now ? "Expired" : "Active";

  return (
    <div className="flex flex-col gap-6">
      <PageHeading title="API tokens">
        <p>
          Personal tokens let scripts (finance exports, reports) call Tributary&apos;s API as you, with your roles in {actor.workspaceName}.{" "}
          <Link href="/settings" className={textLinkClass}>
            Back to settings
          </Link>
        </p>
      </PageHeading>

      <Section id="new-token" title="Create a token" description="The token is shown once; only a hash of it is stored.">
        <CreateTokenForm />
      </Section>

      <Section id="tokens" title="Your tokens">
        {tokens.length === 0 ? (
          <p className="text-sm text-slate-700">No tokens yet.</p>
        ) : (
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm">
              <thead className="border-b border-slate-200 text-xs uppercase tracking-wide text-slate-600">
                <tr>
                  <th scope="col" className="py-2 pr-4 font-medium">Name</th>
                  <th scope="col" className="py-2 pr-4 font-medium">Token</th>
                  <th scope="col" className="py-2 pr-4 font-medium">Created (UTC)</th>
                  <th scope="col" className="py-2 pr-4 font-medium">Expires (UTC)</th>
                  <th scope="col" className="py-2 pr-4 font-medium">Last used (UTC)</th>
                  <th scope="col" className="py-2 pr-4 font-medium">State</th>
                  <th scope="col" className="py-2 font-medium"><span className="sr-only">Actions</span></th>
                </tr>
              </thead>
              <tbody className="divide-y divide-slate-100">
                {tokens.map((token) => {
                  const state = stateOf(token);
                  return (
                    <tr key={token.id} data-testid={`token-${token.name}`}>
                      <td className="py-2 pr-4 font-medium">{token.name}</td>
                      <td className="py-2 pr-4 font-mono text-xs">{token.prefix}…</td>
                      <td className="num py-2 pr-4">{date.format(token.createdAt)}</td>
                      <td className="num py-2 pr-4">{token.expiresAt ? date.format(token.expiresAt) : "Never"}</td>
                      <td className="num py-2 pr-4">{token.lastUsedAt ? date.format(token.lastUsedAt) : "Not yet"}</td>
                      <td className={`py-2 pr-4 ${state === "Active" ? "text-reed" : "text-slate-600"}`}>{state}</td>
                      <td className="py-2 text-right">{state === "Active" ? <RevokeTokenButton tokenId={token.id} name={token.name} /> : null}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
        )}
      </Section>
    </div>
  );
}

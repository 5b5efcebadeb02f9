"use client";
import { useActionState, useState } from "react";
import { Button, SubmitButton } from "@/ui/button";
import { TextField } from "@/ui/field";
import { FormMessage } from "@/ui/form-message";
import { createTokenAction, revokeTokenAction } from "./actions";

const idle = { status: "idle" } as const;

export function CreateTokenForm() {
  const [state, formAction] = useActionState(createTokenAction, idle);
  const [copied, setCopied] = useState(false);
  const errors = state.status === "invalid_data" ? state.fieldErrors : {};
  const token = state.status === "success" ? state.data?.token : undefined;
  return (
    <div className="flex flex-col gap-4">
      <form action={formAction} className="grid gap-4 sm:grid-cols-[2fr_1fr_auto] sm:items-start" noValidate onSubmit={() => setCopied(false)}>
        <TextField label="Name" name="name" required placeholder="Weekly finance export" errors={errors.name} />
        <TextField label="Expires on (optional)" name="expiresOn" type="date" hint="Empty: never expires" errors={errors.expiresOn} />
        <SubmitButton pendingLabel="Creating…" className="sm:mt-6">
          Create token
        </SubmitButton>
      </form>
      <FormMessage state={state} />
      {token ? (
        <div className="rounded-md border border-shallows bg-shallows-pale/60 p-4" data-testid="new-token">
          <label htmlFor="new-token-value" className="text-sm font-medium text-river">
            Your new token (shown only once)
          </label>
          <div className="mt-2 flex flex-wrap gap-2">
            <input id="new-token-value" readOnly value={token} className="num min-w-0 flex-1 rounded border border-slate-300 bg-white px-3 py-2 font-mono text-sm" onFocus={(e) => e.currentTarget.select()} />
            <Button
              type="button"
              variant="secondary"
              onClick={async () => {
                await navigator.clipboard?.writeText(token);
                setCopied(true);
              }}
            >
              {copied ? "Copied" : "Copy"}
            </Button>
          </div>
          <p className="mt-2 text-xs text-slate-700">
            Send it as <code className="font-mono">Authorization: Bearer {token.slice(0, 9)}…</code>; it acts with your roles in this workspace.
          </p>
        </div>
      ) : null}
    </div>
  );
}

export function RevokeTokenButton({ tokenId, name }: { tokenId: string; name: string }) {
  const [state, formAction] = useActionState(revokeTokenAction, idle);
  return (
    <form action={formAction} className="flex flex-col items-end gap-1">
      <input type="hidden" name="tokenId" value={tokenId} />
      <SubmitButton variant="danger" pendingLabel="Revoking…" className="!px-3 !py-1" aria-label={`Revoke the token ${name}`}>
        Revoke
      </SubmitButton>
      <FormMessage state={state} />
    </form>
  );
}

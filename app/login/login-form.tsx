"use client";
import { useActionState } from "react";
import { TextField } from "@/ui/field";
import { SubmitButton } from "@/ui/button";
import { FormMessage } from "@/ui/form-message";
import { signInAction, type SignInState } from "./actions";

export function LoginForm({ callbackUrl, email }: { callbackUrl?: string; email?: string }) {
  const [state, formAction] = useActionState<SignInState, FormData>(signInAction, { status: "idle" });
  const fieldErrors = state.status === "invalid_data" ? state.fieldErrors : {};
  return (
    <form action={formAction} noValidate className="flex flex-col gap-4" aria-describedby="sign-in-message">
      {callbackUrl ? <input type="hidden" name="callbackUrl" value={callbackUrl} /> : null}
      <TextField
        label="E-mail"
        name="email"
        type="email"
        autoComplete="username"
        defaultValue={state.email ?? email}
        required
        autoFocus
        errors={fieldErrors.email}
      />
      <TextField label="Password" name="password" type="password" autoComplete="current-password" required errors={fieldErrors.password} />
      <FormMessage id="sign-in-message" state={state} />
      <SubmitButton pendingLabel="Signing in…">Sign in</SubmitButton>
    </form>
  );
}

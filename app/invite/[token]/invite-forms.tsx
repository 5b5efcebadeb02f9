"use client";
import { useActionState } from "react";
import { SubmitButton } from "@/ui/button";
import { TextField } from "@/ui/field";
import { FormMessage } from "@/ui/form-message";
import { acceptAsSignedInUserAction, acceptWithNewAccountAction } from "./actions";

const idle = { status: "idle" } as const;

export function NewAccountForm({ token, email, minLength }: { token: string; email: string; minLength: number }) {
  const [state, formAction] = useActionState(acceptWithNewAccountAction, idle);
  const errors = state.status === "invalid_data" ? state.fieldErrors : {};
  return (
    <form action={formAction} className="flex flex-col gap-4" noValidate>
      <input type="hidden" name="token" value={token} />
      <TextField label="E-mail" name="email-shown" value={email} readOnly disabled hint="The address the invitation was sent to." />
      <TextField label="Your name" name="name" autoComplete="name" required errors={errors.name} />
      <TextField
        label="Choose a password"
        name="password"
        type="password"
        autoComplete="new-password"
        required
        hint={`At least ${minLength} characters.`}
        errors={errors.password}
      />
      <TextField label="Repeat the password" name="confirmPassword" type="password" autoComplete="new-password" required errors={errors.confirmPassword} />
      <FormMessage state={state} />
      <SubmitButton pendingLabel="Joining…">Join the workspace</SubmitButton>
    </form>
  );
}

export function JoinForm({ token }: { token: string }) {
  const [state, formAction] = useActionState(acceptAsSignedInUserAction, idle);
  return (
    <form action={formAction} className="flex flex-col gap-3">
      <input type="hidden" name="token" value={token} />
      <FormMessage state={state} />
      <SubmitButton pendingLabel="Joining…">Join the workspace</SubmitButton>
    </form>
  );
}

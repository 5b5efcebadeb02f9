"use client";
import { useActionState } from "react";
import type { ActionState } from "@/server/http/action";
import type { Role } from "@/server/authz/roles";
import { SubmitButton } from "@/ui/button";
import { TextField } from "@/ui/field";
import { FormMessage } from "@/ui/form-message";
import {
  changeRolesAction,
  inviteMemberAction,
  removeMemberAction,
  revokeInvitationAction,
  updateWorkspaceAction,
} from "./actions";

const idle = { status: "idle" } as const;
const fieldErrorsOf = (state: ActionState) => (state.status === "invalid_data" ? state.fieldErrors : {});

type RoleOption = { role: Role; label: string; description: string };

function RoleCheckboxes({
  options,
  selected,
  name = "roles",
  legend,
  errors,
  compact = false,
}: {
  options: RoleOption[];
  selected: Role[];
  name?: string;
  legend: string;
  errors?: string[];
  compact?: boolean;
}) {
  return (
    <fieldset className="flex flex-col gap-1" aria-invalid={errors?.length ? true : undefined}>
      <legend className={compact ? "sr-only" : "mb-1 text-sm font-medium text-slate-800"}>{legend}</legend>
      <div className={compact ? "flex flex-wrap gap-x-3 gap-y-1" : "flex flex-col gap-1.5"}>
        {options.map((option) => (
          <label key={option.role} className="inline-flex items-start gap-2 text-sm">
            <input type="checkbox" name={name} value={option.role} defaultChecked={selected.includes(option.role)} className="mt-0.5 accent-shallows" />
            <span>
              {option.label}
              {!compact && <span className="block text-xs text-slate-600">{option.description}</span>}
            </span>
          </label>
        ))}
      </div>
      {errors?.length ? <p className="text-sm text-ember">{errors.join(" ")}</p> : null}
    </fieldset>
  );
}

export function WorkspaceForm({ name, currency, locale }: { name: string; currency: string; locale: string }) {
  const [state, formAction] = useActionState(updateWorkspaceAction, idle);
  const errors = fieldErrorsOf(state);
  return (
    <form action={formAction} className="grid gap-4 sm:grid-cols-3">
      <TextField label="Workspace name" name="name" defaultValue={name} required errors={errors.name} />
      <TextField label="Currency" name="currency" defaultValue={currency} required maxLength={3} hint="ISO 4217 code, e.g. EUR" errors={errors.currency} />
      <TextField label="Number format" name="locale" defaultValue={locale} required hint="Locale tag, e.g. en-IE or de-DE" errors={errors.locale} />
      <div className="flex flex-col gap-2 sm:col-span-3">
        <FormMessage state={state} />
        <div>
          <SubmitButton pendingLabel="Saving…">Save workspace settings</SubmitButton>
        </div>
      </div>
    </form>
  );
}

export function InviteForm({ options }: { options: RoleOption[] }) {
  const [state, formAction] = useActionState(inviteMemberAction, idle);
  const errors = fieldErrorsOf(state);
  return (
    <form action={formAction} className="flex flex-col gap-4" noValidate>
      <TextField label="E-mail address" name="email" type="email" autoComplete="off" required errors={errors.email} />
      <RoleCheckboxes legend="Roles" options={options} selected={[]} errors={errors.roles} />
      <FormMessage state={state} />
      <div>
        <SubmitButton pendingLabel="Sending…">Send invitation</SubmitButton>
      </div>
    </form>
  );
}

export function MemberRow({
  member,
  options,
  isSelf,
}: {
  member: { userId: string; name: string | null; email: string; roles: Role[] };
  options: RoleOption[];
  isSelf: boolean;
}) {
  const [rolesState, rolesAction] = useActionState(changeRolesAction, idle);
  const [removeState, removeAction] = useActionState(removeMemberAction, idle);
  const label = member.name ?? member.email;
  return (
    <li className="flex flex-col gap-2 py-3" data-testid={`member-${member.email}`}>
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <span>
          <span className="font-medium">{label}</span> <span className="text-sm text-slate-600">{member.email}</span>
          {isSelf ? <span className="ml-2 text-xs text-slate-600">(you)</span> : null}
        </span>
      </div>
      <div className="flex flex-wrap items-center justify-between gap-3">
        <form action={rolesAction} className="flex flex-wrap items-center gap-3">
          <input type="hidden" name="userId" value={member.userId} />
          <RoleCheckboxes legend={`Roles of ${label}`} options={options} selected={member.roles} compact errors={fieldErrorsOf(rolesState).roles} />
          <SubmitButton variant="secondary" pendingLabel="Saving…" className="!px-3 !py-1">
            Save roles
          </SubmitButton>
        </form>
        <form action={removeAction}>
          <input type="hidden" name="userId" value={member.userId} />
          <SubmitButton variant="danger" pendingLabel="Removing…" className="!px-3 !py-1" aria-label={`Remove ${label} from the workspace`}>
            Remove
          </SubmitButton>
        </form>
      </div>
      <FormMessage state={rolesState.status === "invalid_data" ? idle : rolesState} />
      <FormMessage state={removeState} />
    </li>
  );
}

export function RevokeInvitationButton({ invitationId, email }: { invitationId: string; email: string }) {
  const [state, formAction] = useActionState(revokeInvitationAction, idle);
  return (
    <form action={formAction} className="flex flex-col items-end gap-1">
      <input type="hidden" name="invitationId" value={invitationId} />
      <SubmitButton variant="quiet" pendingLabel="Withdrawing…" aria-label={`Withdraw the invitation to ${email}`}>
        Withdraw
      </SubmitButton>
      <FormMessage state={state} />
    </form>
  );
}

import "server-only";
import { redirect, unstable_rethrow } from "next/navigation";
import { z } from "zod";
import { AppError, toAppError } from "@/server/errors";
import { requireActor, requirePermission, type Actor } from "@/server/authz/actor";
import type { Permission } from "@/server/authz/roles";

/**
 * What a wrapped server action returns, for `useActionState`. `fieldErrors` maps a dotted field
 * path to its messages so forms can show each next to its input.
 */
export type ActionState<T = unknown> =
  | { status: "idle" }
  | { status: "success"; message?: string; data?: T }
  | { status: "invalid_data"; message: string; fieldErrors: Record<string, string[]> }
  | { status: "forbidden"; message: string }
  | { status: "error"; message: string; code?: string };

export const idleState: ActionState<never> = { status: "idle" };

/** FormData → plain object; a key sent several times (checkboxes) becomes an array. */
export function formDataToObject(formData: FormData): Record<string, unknown> {
  const result: Record<string, unknown> = {};
  for (const key of new Set(formData.keys())) {
    if (key.startsWith("$ACTION")) continue; // Next's own fields
    const values = formData.getAll(key);
    result[key] = values.length === 1 ? values[0] : values;
  }
  return result;
}

/** A form field that may be sent once, several times, or not at all (checkbox groups) → always an array. */
export const formList = <T extends z.ZodType>(item: T) =>
  z.preprocess((value) => (value === undefined || value === "" ? [] : Array.isArray(value) ? value : [value]), z.array(item));

/** An optional text field: blank becomes undefined. */
export const formOptional = <T extends z.ZodType>(inner: T) =>
  z.preprocess((value) => (typeof value === "string" && value.trim() === "" ? undefined : value), inner.optional());

/** What the wrapped function returns: a confirmation for the user and/or data for the form. */
type ActionResult<T> = { message?: string; data?: T } | void;

/**
 * Wraps a server action: checks the actor (not signed in → redirect to /login) and the permission
 * (→ "forbidden"), validates the input with zod (FormData or a plain object; → "invalid_data" with
 * per-field messages), and turns thrown AppErrors into states. Return `{ message }` to confirm what
 * happened and/or `{ data }` for the form. `redirect()` inside works as usual.
 *
 * @example
 * export const removeMemberAction = action(
 *   z.object({ userId: z.string().min(1) }),
 *   { permission: "workspace:admin" },
 *   async ({ userId }, { actor }) => {
 *     await removeMember({ workspaceId: actor.workspaceId, userId, actorUserId: actor.userId });
 *     revalidatePath("/settings");
 *     return { message: "Member removed." };
 *   },
 * );
 * // in a client component: const [state, formAction] = useActionState(removeMemberAction, idleState);
 */
export function action<S extends z.ZodType, T = undefined>(
  schema: S,
  options: { permission?: Permission },
  fn: (input: z.output<S>, context: { actor: Actor }) => Promise<ActionResult<T>>,
): (previous: ActionState<T>, input: FormData | z.input<S>) => Promise<ActionState<T>> {
  return async (_previous, input) => {
    let actor: Actor;
    try {
      actor = await requireActor();
    } catch (error) {
      unstable_rethrow(error);
      if (error instanceof AppError && error.type === "unauthenticated") redirect("/login");
      const appError = toAppError(error, "server action");
      return appError.type === "forbidden"
        ? { status: "forbidden", message: appError.message }
        : { status: "error", message: appError.message, code: appError.code };
    }
    try {
      if (options.permission) requirePermission(actor, options.permission);
      const raw = input instanceof FormData ? formDataToObject(input) : input;
      const parsed = await schema.safeParseAsync(raw);
      if (!parsed.success) return invalid(parsed.error);
      const result = await fn(parsed.data, { actor });
      return { status: "success", message: result?.message, data: result?.data };
    } catch (error) {
      unstable_rethrow(error); // redirect(), notFound() and friends
      const appError = toAppError(error, "server action");
      if (appError.type === "forbidden") return { status: "forbidden", message: appError.message };
      if (appError.type === "invalid") {
        const fieldErrors: Record<string, string[]> = {};
        for (const detail of appError.details) (fieldErrors[detail.path ?? ""] ??= []).push(detail.message);
        return { status: "invalid_data", message: appError.message, fieldErrors };
      }
      return { status: "error", message: appError.message, code: appError.code };
    }
  };
}

function invalid(error: z.ZodError): ActionState<never> {
  const fieldErrors: Record<string, string[]> = {};
  for (const issue of error.issues) (fieldErrors[issue.path.map(String).join(".")] ??= []).push(issue.message);
  const count = error.issues.length;
  return {
    status: "invalid_data",
    message: count === 1 ? error.issues[0].message : `Please correct the ${count} highlighted fields.`,
    fieldErrors,
  };
}

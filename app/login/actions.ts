"use server";
import { AuthError, CredentialsSignin } from "next-auth";
import { headers } from "next/headers";
import { z } from "zod";
import { signIn } from "@/server/auth";
import { checkSignInThrottle, clientAddress, throttleMessage } from "@/server/auth/throttle";
import { toAppError } from "@/server/errors";
import type { ActionState } from "@/server/http/action";

const signInSchema = z.object({
  email: z
    .string()
    .trim()
    .min(1, "Enter your e-mail address.")
    .pipe(z.email("Enter a valid e-mail address, like name@example.com.")),
  password: z.string().min(1, "Enter your password.").max(200, "That password is too long."),
  callbackUrl: z.string().optional(),
});

/** Only paths on this site: "/fits?x=1" yes, "//evil.example" or "https://…" no. */
function safeCallback(url: string | undefined): string {
  return url && url.startsWith("/") && !url.startsWith("//") && !url.startsWith("/\\") ? url : "/";
}

/** The action's state also carries the address typed, so the form can keep it after React resets it. */
export type SignInState = ActionState & { email?: string };

export async function signInAction(_previous: SignInState, formData: FormData): Promise<SignInState> {
  const email = String(formData.get("email") ?? "").trim();
  const state = await attemptSignIn(formData);
  return { ...state, email };
}

async function attemptSignIn(formData: FormData): Promise<ActionState> {
  const parsed = signInSchema.safeParse({
    email: formData.get("email") ?? "",
    password: formData.get("password") ?? "",
    callbackUrl: formData.get("callbackUrl") ?? undefined,
  });
  if (!parsed.success) {
    const fieldErrors: Record<string, string[]> = {};
    for (const issue of parsed.error.issues) (fieldErrors[String(issue.path[0])] ??= []).push(issue.message);
    return { status: "invalid_data", message: parsed.error.issues[0].message, fieldErrors };
  }
  const email = parsed.data.email.toLowerCase();
  const ip = clientAddress(await headers());
  try {
    const throttle = await checkSignInThrottle({ email, ip });
    if (throttle.throttled) return { status: "error", code: "throttled", message: throttleMessage(throttle) };
    await signIn("credentials", { email, password: parsed.data.password, redirectTo: safeCallback(parsed.data.callbackUrl) });
    return { status: "success" }; // not reached: signIn redirects
  } catch (error) {
    if (error instanceof CredentialsSignin) {
      if (error.code === "throttled") {
        const throttle = await checkSignInThrottle({ email, ip });
        if (throttle.throttled) return { status: "error", code: "throttled", message: throttleMessage(throttle) };
      }
      return { status: "error", code: "credentials", message: "Wrong e-mail or password." };
    }
    if (error instanceof AuthError) {
      // authorize() itself failed (e.g. the database is down): the cause says which.
      const appError = toAppError((error as { cause?: { err?: unknown } }).cause?.err ?? error, "sign-in");
      return { status: "error", message: appError.message };
    }
    // signIn's success redirect is an exception too; let Next handle it.
    if (isNextControlFlow(error)) throw error;
    return { status: "error", message: toAppError(error, "sign-in").message };
  }
}

function isNextControlFlow(error: unknown): boolean {
  const digest = (error as { digest?: unknown } | null)?.digest;
  return typeof digest === "string" && (digest.startsWith("NEXT_REDIRECT") || digest.startsWith("NEXT_HTTP_ERROR") || digest === "DYNAMIC_SERVER_USAGE");
}

"use client";

import { useActionState } from "react";
import { Mail } from "lucide";
import { Icon } from "@/components/ui/icon";
import { requestSignInLink, type SignInFormState } from "@/app/(auth)/sign-in/actions";
import { Button } from "@/components/ui/button";

export function SignInForm({ callbackUrl }: { callbackUrl: string }) {
  const [state, action, pending] = useActionState<SignInFormState, FormData>(requestSignInLink, {});
  const emailError = state.fields?.email;
  return (
    <form action={action} className="flex flex-col gap-3" noValidate>
      <input type="hidden" name="callbackUrl" value={callbackUrl} />
      <label htmlFor="email" className="text-sm font-medium">
        E-mail address
      </label>
      <input
        id="email"
        name="email"
        type="email"
        autoComplete="email"
        required
        defaultValue={state.email}
        aria-invalid={emailError ? true : undefined}
        aria-describedby={emailError ? "email-error" : "email-hint"}
        className="rounded-lg border border-line bg-surface px-3 py-2.5 text-base aria-invalid:border-rose"
      />
      {emailError ? (
        <p id="email-error" className="text-sm text-rose">{emailError}</p>
      ) : (
        <p id="email-hint" className="text-sm text-muted">We e-mail you a link that works once, for 10 minutes.</p>
      )}
      {state.error && !emailError ? <p role="alert" className="text-sm text-rose">{state.error}</p> : null}
      <Button type="submit" disabled={pending}>
        <Icon node={Mail} className="h-4 w-4" /> {pending ? "Sending…" : "E-mail me a sign-in link"}
      </Button>
    </form>
  );
}

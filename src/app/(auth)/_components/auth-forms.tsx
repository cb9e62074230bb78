"use client";
import { useActionState } from "react";
import Link from "next/link";
import type { ActionState } from "@/server/action";
import { FieldError, FormMessage as Message } from "@/components/forms/form-bits";

type Action = (prev: ActionState, form: FormData) => Promise<ActionState>;

export function SignInForm({ action, next }: { action: Action; next?: string }) {
  const [state, formAction, pending] = useActionState(action, null);
  return (
    <form action={formAction} className="flex flex-col gap-3" noValidate>
      <h1 className="text-lg">Sign in</h1>
      <Message state={state} />
      {next ? <input type="hidden" name="next" value={next} /> : null}
      <label>
        <span className="field-label">E-mail</span>
        <input className="input" name="email" type="email" autoComplete="username" required />
        <FieldError state={state} name="email" />
      </label>
      <label>
        <span className="field-label">Password</span>
        <input className="input" name="password" type="password" autoComplete="current-password" required />
        <FieldError state={state} name="password" />
      </label>
      <button className="btn-primary mt-1" type="submit" disabled={pending}>
        {pending ? "Signing in…" : "Sign in"}
      </button>
      <Link href="/forgot-password" className="text-xs">
        Forgot your password?
      </Link>
    </form>
  );
}

export function ForgotForm({ action }: { action: Action }) {
  const [state, formAction, pending] = useActionState(action, null);
  return (
    <form action={formAction} className="flex flex-col gap-3" noValidate>
      <h1 className="text-lg">Reset your password</h1>
      <p className="text-sm text-ink-muted">We&rsquo;ll e-mail a link that works once, for one hour.</p>
      <Message state={state} />
      <label>
        <span className="field-label">E-mail</span>
        <input className="input" name="email" type="email" autoComplete="username" required />
        <FieldError state={state} name="email" />
      </label>
      <button className="btn-primary" type="submit" disabled={pending}>
        {pending ? "Sending…" : "Send the link"}
      </button>
      <Link href="/sign-in" className="text-xs">
        Back to sign-in
      </Link>
    </form>
  );
}

export function NewPasswordForm({ action, token }: { action: Action; token: string }) {
  const [state, formAction, pending] = useActionState(action, null);
  return (
    <form action={formAction} className="flex flex-col gap-3" noValidate>
      <h1 className="text-lg">Choose a new password</h1>
      <Message state={state} />
      <input type="hidden" name="token" value={token} />
      <label>
        <span className="field-label">New password (at least 10 characters)</span>
        <input className="input" name="password" type="password" autoComplete="new-password" required minLength={10} />
        <FieldError state={state} name="password" />
      </label>
      <p className="text-xs text-ink-muted">Saving signs you out everywhere else.</p>
      <button className="btn-primary" type="submit" disabled={pending}>
        Save and sign in
      </button>
    </form>
  );
}

export function AcceptInviteForm({ action, token, existing }: { action: Action; token: string; existing: boolean }) {
  const [state, formAction, pending] = useActionState(action, null);
  return (
    <form action={formAction} className="flex flex-col gap-3" noValidate>
      <Message state={state} />
      <input type="hidden" name="token" value={token} />
      {existing ? null : (
        <label>
          <span className="field-label">Your name</span>
          <input className="input" name="name" autoComplete="name" required />
          <FieldError state={state} name="name" />
        </label>
      )}
      <label>
        <span className="field-label">
          {existing ? "Password of your existing account" : "Choose a password (at least 10 characters)"}
        </span>
        <input
          className="input"
          name="password"
          type="password"
          autoComplete={existing ? "current-password" : "new-password"}
          required
        />
        <FieldError state={state} name="password" />
      </label>
      <button className="btn-primary" type="submit" disabled={pending}>
        Accept and continue
      </button>
    </form>
  );
}

"use client";

import { useActionState } from "react";
import { logInAction, type LogInState } from "./actions";

export function LogInForm({ next }: { next: string }) {
  const [state, action, pending] = useActionState<LogInState, FormData>(logInAction, {});
  return (
    <form action={action} className="stack" data-testid="log-in-form" style={{ maxWidth: 360 }}>
      <input type="hidden" name="next" value={next} />
      <label>
        User name
        <input
          name="username"
          autoComplete="username"
          defaultValue={state.username ?? ""}
          required
          data-testid="log-in-username"
        />
      </label>
      <label>
        Password
        <input name="password" type="password" autoComplete="current-password" required data-testid="log-in-password" />
      </label>
      {state.error ? (
        <p className="sev-error" role="alert" data-testid="log-in-error">
          {state.error}
        </p>
      ) : null}
      <button type="submit" disabled={pending} data-testid="log-in-submit">
        {pending ? "Signing in…" : "Sign in"}
      </button>
    </form>
  );
}

"use server";

import { cookies, headers } from "next/headers";
import { redirect } from "next/navigation";
import { z } from "zod";
import { logIn, logOut } from "@/lib/store/accounts";
import { SESSION_COOKIE, safeNext, sessionCookieSecure } from "../access";

export interface LogInState {
  username?: string;
  error?: string;
}

const logInSchema = z.object({
  username: z.string().trim().min(1, "Give your user name").max(40),
  password: z.string().min(1, "Give your password").max(200),
  next: z.string().max(2000).optional(),
});

/** Check the user name and password, set the session cookie and go back to the page that asked for it. */
export async function logInAction(_prev: LogInState, form: FormData): Promise<LogInState> {
  const parsed = logInSchema.safeParse({
    username: form.get("username") ?? "",
    password: form.get("password") ?? "",
    next: form.get("next") ?? undefined,
  });
  const username = String(form.get("username") ?? "");
  if (!parsed.success) return { username, error: parsed.error.issues[0].message };
  const jar = await cookies();
  // a session this browser already holds ends with this log-in: one browser, one live session
  const res = await logIn(parsed.data.username, parsed.data.password, new Date(), jar.get(SESSION_COOKIE)?.value ?? null);
  if (!res.ok) return { username, error: res.reason };
  // secure only over HTTPS, which only a trusted proxy can report: the default installation serves plain HTTP on 127.0.0.1
  jar.set(SESSION_COOKIE, res.token, {
    httpOnly: true,
    sameSite: "lax",
    secure: sessionCookieSecure((await headers()).get("x-forwarded-proto")),
    path: "/",
    expires: new Date(res.expiresAt),
  });
  redirect(safeNext(parsed.data.next));
}

/** End the session and show the log-in page. */
export async function logOutAction(): Promise<void> {
  const jar = await cookies();
  logOut(jar.get(SESSION_COOKIE)?.value);
  jar.delete(SESSION_COOKIE);
  redirect("/login");
}

import { NextResponse, type NextRequest } from "next/server";
import { hostAllowed } from "./app/allowedHost";

/**
 * Every request first: refuse one whose Host header is not a name of this installation (`app/allowedHost.ts`), so a
 * page on another site that points its own name at this machine cannot use the app through the user's browser.
 */
export function proxy(request: NextRequest) {
  if (hostAllowed(request.headers.get("host"), process.env)) return NextResponse.next();
  return new NextResponse(
    "Misdirected request: this cpet-desk installation answers only to localhost, 127.0.0.1, ::1, the HOST it was started on and the names in CPET_ALLOWED_HOSTS.",
    { status: 421, headers: { "content-type": "text/plain; charset=utf-8" } },
  );
}

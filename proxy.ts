import { NextResponse, type NextRequest } from "next/server";
import { crossSiteWrite, hostAllowed } from "./app/allowedHost";

/**
 * Every request first: refuse one whose Host header is not a name of this installation (`app/allowedHost.ts`), so a
 * page on another site that points its own name at this machine cannot use the app through the user's browser; then
 * refuse a write sent from another site's page (403), which the server-action origin check would have answered with 500.
 */
export function proxy(request: NextRequest) {
  const h = request.headers;
  if (!hostAllowed(h.get("host"), process.env)) return misdirected();
  if (crossSiteWrite(request.method, h.get("origin"), h.get("host"), h.get("x-forwarded-host")))
    return new NextResponse(
      "Refused: this form was sent from another site's page. Open cpet-desk at its own address and send it from there.",
      { status: 403, headers: { "content-type": "text/plain; charset=utf-8" } },
    );
  return NextResponse.next();
}

function misdirected() {
  return new NextResponse(
    "Misdirected request: this cpet-desk installation answers only to localhost, 127.0.0.1, ::1, the HOST it was started on and the names in CPET_ALLOWED_HOSTS.",
    { status: 421, headers: { "content-type": "text/plain; charset=utf-8" } },
  );
}

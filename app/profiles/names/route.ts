import { NextResponse } from "next/server";
import { listProfiles } from "@/lib/store/profiles";
import { routeAccess } from "@/app/access";

export const dynamic = "force-dynamic";

/** Names of the saved mapping profiles (for the profile choice on the upload form). */
export async function GET() {
  const access = await routeAccess();
  if (access instanceof Response) return access;
  return NextResponse.json(listProfiles().map((p) => p.name));
}

import { NextResponse } from "next/server";
import { listProfiles } from "@/lib/store/profiles";

export const dynamic = "force-dynamic";

/** Names of the saved mapping profiles (for the profile choice on the upload form). */
export function GET() {
  return NextResponse.json(listProfiles().map((p) => p.name));
}

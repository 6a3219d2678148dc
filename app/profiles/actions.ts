"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { deleteProfile } from "@/lib/store/profiles";
import { actionAccess } from "../access";

const deleteSchema = z.object({ name: z.string().trim().min(1).max(200) });

/** Delete a saved mapping profile by name (tests already read with it keep their decisions). */
export async function deleteProfileAction(form: FormData): Promise<void> {
  const { actor } = await actionAccess("/profiles");
  const parsed = deleteSchema.safeParse({ name: form.get("name") });
  if (!parsed.success) return;
  deleteProfile(parsed.data.name, actor);
  revalidatePath("/profiles");
}

"use server";
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { getSessionUser } from "@/lib/auth/session";
import { acceptInvitation, invitationTokenSchema } from "@/lib/invitations";

export interface AcceptState {
  message?: string;
}

/** Accepts the invitation for the signed-in person, then opens the study. */
export async function acceptInvitationAction(_previous: AcceptState, formData: FormData): Promise<AcceptState> {
  const parsed = invitationTokenSchema.safeParse(formData.get("token"));
  if (!parsed.success) return { message: "This invitation link is not complete." };
  const user = await getSessionUser();
  if (!user) redirect(`/sign-in?next=${encodeURIComponent(`/invite/${parsed.data}`)}`);
  const result = await acceptInvitation(user, parsed.data);
  if (!result.ok) return { message: result.message };
  revalidatePath("/studies");
  redirect(`/studies/${result.studyId}`);
}

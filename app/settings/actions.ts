"use server";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getSessionUser } from "@/lib/auth/session";
import { NOTIFY_MODES, setNotifyMode } from "@/lib/pins/notify";

export interface NotifySettingsState {
  ok?: boolean;
  message?: string;
  mode?: (typeof NOTIFY_MODES)[number];
}

const settingsSchema = z.object({ notifyMode: z.enum(NOTIFY_MODES, { error: "Choose immediate, daily digest or off." }) });

export async function saveNotifySettings(_previous: NotifySettingsState, formData: FormData): Promise<NotifySettingsState> {
  const user = await getSessionUser();
  if (!user) return { ok: false, message: "Your session has ended; sign in again to change your settings." };
  const parsed = settingsSchema.safeParse({ notifyMode: formData.get("notifyMode") });
  if (!parsed.success) return { ok: false, message: z.flattenError(parsed.error).fieldErrors.notifyMode?.[0] ?? "Choose a setting." };
  await setNotifyMode(user.id, parsed.data.notifyMode);
  revalidatePath("/settings");
  return { ok: true, mode: parsed.data.notifyMode, message: "Saved." };
}

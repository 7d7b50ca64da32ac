"use server";

import { revalidatePath } from "next/cache";
import { requireAdmin } from "@/lib/auth/guards";
import { updateRepairSettings } from "@/lib/repairs/settings";
import { validatedAction } from "@/lib/validation/action";
import { repairSettingsSchema } from "@/lib/validation/repair-settings";

export const saveRepairSettingsAction = validatedAction(repairSettingsSchema, async (input) => {
  const ctx = await requireAdmin();
  updateRepairSettings(ctx, input);
  revalidatePath("/studio/settings/repairs");
  return { ok: true as const, data: undefined, message: "Repair prices, rounding and tax saved. Quotes priced from now on use them; quotes already sent keep theirs." };
});

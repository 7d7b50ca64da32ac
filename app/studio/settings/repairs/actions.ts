"use server";

import { revalidatePath } from "next/cache";
import { action } from "@/lib/http/action";
import { updateRepairSettings } from "@/lib/repairs/settings";
import { repairSettingsSchema } from "@/lib/validation/repair-settings";

export const saveRepairSettingsAction = action({ roles: ["admin"], schema: repairSettingsSchema }, (input, actor) => {
  updateRepairSettings(actor, input);
  revalidatePath("/studio/settings/repairs");
  return { ok: true as const, data: undefined, message: "Repair prices, rounding and tax saved. Quotes priced from now on use them; quotes already sent keep theirs." };
});

import { can, type CurrentUser } from "@/lib/auth/guards";
import { canReadApparatus, canWriteApparatus, type ApparatusOwnership } from "@/lib/apparatus/access";

// Who keeps an apparatus up: whoever may edit it (its owner and department colleagues with
// apparatus.write) and safety officers for any apparatus (apparatus.upkeep.any). Everyone who reads
// the apparatus reads its inspection records.

export function canKeepUp(user: CurrentUser, record: ApparatusOwnership): boolean {
  if (canWriteApparatus(user, record)) return true;
  return can(user, "apparatus.upkeep.any") && canReadApparatus(user, record);
}

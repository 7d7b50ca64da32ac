// The care plan section of the owner's piece page: loads the owner's plans for the piece (lib/plans) and renders components/plans,
// with the owner's cancel control under the plan the piece is under.
import type { User } from "lucia";
import { OwnerPlanCancelForm } from "@/components/plans/owner-plan-cancel-form";
import { PiecePlans } from "@/components/plans/piece-plans";
import { myPlanControl } from "@/lib/plans/cancel";
import { plansForMyPiece } from "@/lib/plans/offers";

export function CarePlanSection({ user, pieceId, timeZone }: { user: Pick<User, "id">; pieceId: string; timeZone: string }) {
  const control = myPlanControl(user, pieceId);
  return (
    <>
      <PiecePlans pieceId={pieceId} timeZone={timeZone} {...plansForMyPiece(user, pieceId)} />
      {control ? <OwnerPlanCancelForm control={control} timeZone={timeZone} country={control.country} /> : null}
    </>
  );
}

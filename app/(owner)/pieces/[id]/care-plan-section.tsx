// The care plan section of the owner's piece page: loads the owner's plans for the piece (lib/plans) and renders components/plans.
import type { User } from "lucia";
import { PiecePlans } from "@/components/plans/piece-plans";
import { plansForMyPiece } from "@/lib/plans/offers";

export function CarePlanSection({ user, pieceId, timeZone }: { user: Pick<User, "id">; pieceId: string; timeZone: string }) {
  return <PiecePlans pieceId={pieceId} timeZone={timeZone} {...plansForMyPiece(user, pieceId)} />;
}

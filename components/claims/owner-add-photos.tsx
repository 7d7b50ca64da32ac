"use client";

import { useRouter } from "next/navigation";
import { PhotoPicker, PhotoQueueList, stillToUpload, usePhotoQueue } from "./photo-queue";

/** More photos for an open claim: each uploads as soon as it is picked, with progress and retry. */
export function OwnerAddPhotos({ claimId, existing }: { claimId: string; existing: number }) {
  const router = useRouter();
  const queue = usePhotoQueue(`claim:${claimId}`);
  // Shown: the photos not on the claim yet, with why one failed; counted against the claim's room: those still to send.
  const pending = queue.items.filter((i) => i.status !== "done");
  return (
    <div className="space-y-3">
      <PhotoPicker
        count={existing + stillToUpload(queue.items).length}
        refused={queue.refused}
        onFiles={async (files) => {
          // The photos already on the claim use up its room: more than fits is refused here, with words, before any upload.
          const added = queue.add(files, existing);
          let any = false;
          for (const item of added) any = (await queue.uploadOne(item, claimId)) || any;
          queue.pruneDone();
          if (any) router.refresh();
        }}
      />
      <PhotoQueueList items={pending} onRetry={(i) =>
          void queue.uploadOne(i, claimId).then((ok) => {
            if (!ok) return;
            queue.pruneDone();
            router.refresh();
          })
        } onRemove={(i) => void queue.remove(i)} />
    </div>
  );
}

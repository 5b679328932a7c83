import { useEffect, useMemo, useState } from 'react';
import { useSessionPhotos } from '@/lib/db/live';
import { addPhoto } from '@/lib/db/photos';
import { shrinkPhoto } from '@/lib/photo-shrink';
import type { ItemResult } from '@/lib/db/records';
import { SaveProblems } from '@/components/field/save-problems';
import type { StoredPhoto } from '@/lib/db/field-db';

function Thumb({ photo }: { photo: StoredPhoto }) {
  const url = useMemo(() => (photo.blob ? URL.createObjectURL(photo.blob) : `/api/photos/${photo.id}/thumb`), [photo.blob, photo.id]);
  useEffect(() => () => (photo.blob ? URL.revokeObjectURL(url) : undefined), [url, photo.blob]);
  return (
    <figure className="w-28">
      <img src={url} alt={photo.caption || 'Pose photo'} className="h-24 w-28 rounded border-2 border-rule object-cover" />
      <figcaption className="text-xs">
        {photo.status === 'pending' ? 'waiting to upload' : photo.status === 'failed' ? `refused: ${photo.error}` : 'on the server'}
      </figcaption>
    </figure>
  );
}

/** Photos from the camera, kept on the phone until the server has them. */
export function PhotoCapture({ sessionId, poseId }: { sessionId: string; poseId: string }) {
  const photos = useSessionPhotos(sessionId)?.filter((p) => p.poseId === poseId);
  const [problems, setProblems] = useState<ItemResult[]>([]);
  return (
    <section className="space-y-2">
      <label className="btn w-full cursor-pointer">
        Take a photo
        <input
          type="file"
          accept="image/*"
          capture="environment"
          className="sr-only"
          onChange={async (e) => {
            const files = [...(e.target.files ?? [])];
            e.target.value = '';
            setProblems(
              await Promise.all(
                files.map(async (file) => addPhoto({ id: crypto.randomUUID(), sessionId, poseId, caption: '', file: await shrinkPhoto(file) })),
              ),
            );
          }}
        />
      </label>
      <SaveProblems results={problems} />
      <div className="flex flex-wrap gap-2" data-testid="pose-photos">
        {photos?.map((p) => (
          <Thumb key={p.id} photo={p} />
        ))}
      </div>
    </section>
  );
}

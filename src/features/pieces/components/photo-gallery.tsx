import { ImagePlus, Maximize2, Pencil, Trash2, Upload, X } from 'lucide-react';
import { useRef, useState, type DragEvent } from 'react';
import { PHOTO_LIMITS, type Photo } from '@shared/schemas/customers';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Dialog } from '@/components/dialog';
import { useDeletePhoto, useUpdatePhotoCaption, useUploadPhotos } from '../api/photos';

interface Pending {
  key: string;
  file: File;
  caption: string;
  preview: string;
}

const MB = 1024 * 1024;

/** A file's size as people read it: "340 KB" for a small photo, "2.4 MB" for a large one. */
export function fileSize(bytes: number): string {
  if (bytes < 1024) return `${bytes} bytes`;
  if (bytes < MB) return `${Math.max(1, Math.round(bytes / 1024))} KB`;
  return `${(bytes / MB).toFixed(1)} MB`;
}

/** Checks files against what the server accepts, before sending them. */
export function checkFiles(files: File[], already: number): { ok: File[]; problems: string[] } {
  const ok: File[] = [];
  const problems: string[] = [];
  for (const f of files) {
    if (!(PHOTO_LIMITS.types as readonly string[]).includes(f.type)) problems.push(`${f.name}: not a JPEG, PNG or WebP image.`);
    else if (f.size > PHOTO_LIMITS.maxBytes) problems.push(`${f.name}: ${fileSize(f.size)} is over the ${PHOTO_LIMITS.maxBytes / MB} MB limit.`);
    else if (already + ok.length >= PHOTO_LIMITS.maxFiles) problems.push(`${f.name}: at most ${PHOTO_LIMITS.maxFiles} photos go in one upload.`);
    else ok.push(f);
  }
  return { ok, problems };
}

function CaptionEditor({ photo, pieceId, onDone }: { photo: Photo; pieceId: number; onDone: () => void }) {
  const update = useUpdatePhotoCaption(pieceId);
  const [caption, setCaption] = useState(photo.caption);
  return (
    <form
      className="space-y-1"
      onSubmit={(e) => {
        e.preventDefault();
        update.mutate({ id: photo.id, caption: caption.trim() }, { onSuccess: onDone });
      }}
    >
      <label className="sr-only" htmlFor={`caption-${photo.id}`}>Caption</label>
      <input id={`caption-${photo.id}`} autoFocus maxLength={300} value={caption} onChange={(e) => setCaption(e.target.value)} className="block w-full rounded border border-walnut-200 px-2 py-1 text-xs" />
      {update.isError && <p className="text-xs text-brick-700" role="alert">▲ {update.error.message}</p>}
      <div className="flex gap-1">
        <Button size="sm" type="submit" busy={update.isPending}>Save</Button>
        <Button size="sm" variant="ghost" onClick={onDone}>Cancel</Button>
      </div>
    </form>
  );
}

/** Condition photos: drop or pick several at once, caption them, view them large, delete with confirmation. */
export function PhotoGallery({ pieceId, photos, canEdit }: { pieceId: number; photos: Photo[]; canEdit: boolean }) {
  const upload = useUploadPhotos(pieceId);
  const remove = useDeletePhoto(pieceId);
  const input = useRef<HTMLInputElement>(null);
  const [pending, setPending] = useState<Pending[]>([]);
  const [problems, setProblems] = useState<string[]>([]);
  const [dragging, setDragging] = useState(false);
  const [editing, setEditing] = useState<number | null>(null);
  const [viewing, setViewing] = useState<Photo | null>(null);
  const [deleting, setDeleting] = useState<Photo | null>(null);

  const add = (files: File[]) => {
    const { ok, problems: p } = checkFiles(files, pending.length);
    setProblems(p);
    setPending((prev) => [...prev, ...ok.map((file, i) => ({ key: `${Date.now()}-${i}-${file.name}`, file, caption: '', preview: URL.createObjectURL(file) }))]);
  };
  const clear = () => {
    pending.forEach((p) => URL.revokeObjectURL(p.preview));
    setPending([]);
  };
  const onDrop = (e: DragEvent) => {
    e.preventDefault();
    setDragging(false);
    add([...e.dataTransfer.files]);
  };
  const send = () =>
    upload.mutate(
      { files: pending.map((p) => p.file), captions: pending.map((p) => p.caption.trim()) },
      { onSuccess: () => clear() },
    );

  return (
    <div className="space-y-4">
      {canEdit && (
        <div
          onDragOver={(e) => {
            e.preventDefault();
            setDragging(true);
          }}
          onDragLeave={() => setDragging(false)}
          onDrop={onDrop}
          className={`rounded-xl border-2 border-dashed px-4 py-6 text-center transition-colors ${dragging ? 'border-amber-500 bg-amber-50' : 'border-walnut-200 bg-parchment-50'}`}
          data-testid="photo-drop"
        >
          <ImagePlus className="mx-auto h-8 w-8 text-amber-600" aria-hidden />
          <p className="mt-2 text-sm text-walnut-700">
            Drop condition photos here, or{' '}
            <button type="button" className="font-semibold text-walnut-900 underline decoration-amber-400 underline-offset-2" onClick={() => input.current?.click()}>
              choose files
            </button>
            .
          </p>
          <p className="mt-1 text-xs text-walnut-500">JPEG, PNG or WebP; up to {PHOTO_LIMITS.maxBytes / MB} MB each and {PHOTO_LIMITS.maxFiles} at a time.</p>
          <input
            ref={input}
            type="file"
            multiple
            accept={PHOTO_LIMITS.types.join(',')}
            className="sr-only"
            aria-label="Choose photos to upload"
            onChange={(e) => {
              add([...(e.target.files ?? [])]);
              e.target.value = '';
            }}
          />
        </div>
      )}
      {problems.length > 0 && (
        <Alert tone="warning" title="Some files were left out">
          <ul className="list-disc pl-4">{problems.map((p) => <li key={p}>{p}</li>)}</ul>
        </Alert>
      )}
      {pending.length > 0 && (
        <div className="rounded-xl border border-amber-300 bg-white p-3 shadow-card">
          <p className="mb-2 text-sm font-semibold text-walnut-800">Ready to upload ({pending.length})</p>
          <ul className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
            {pending.map((p) => (
              <li key={p.key} className="flex gap-2">
                <img src={p.preview} alt="" className="h-16 w-16 shrink-0 rounded object-cover" />
                <div className="min-w-0 flex-1">
                  <p className="truncate text-xs text-walnut-600">{p.file.name} · {fileSize(p.file.size)}</p>
                  <input
                    aria-label={`Caption for ${p.file.name}`}
                    placeholder="Caption (optional)"
                    maxLength={300}
                    value={p.caption}
                    onChange={(e) => setPending((all) => all.map((x) => (x.key === p.key ? { ...x, caption: e.target.value } : x)))}
                    className="mt-1 block w-full rounded border border-walnut-200 px-2 py-1 text-xs"
                  />
                </div>
                <button type="button" className="self-start rounded p-1 text-walnut-500 hover:bg-walnut-50" aria-label={`Leave out ${p.file.name}`} onClick={() => setPending((all) => all.filter((x) => x.key !== p.key))}>
                  <X className="h-3.5 w-3.5" aria-hidden />
                </button>
              </li>
            ))}
          </ul>
          {upload.isPending && (
            <div className="mt-3" role="progressbar" aria-label="Upload progress" aria-valuemin={0} aria-valuemax={100} aria-valuenow={Math.round(upload.progress * 100)}>
              <div className="h-2 rounded-full bg-parchment-200">
                <div className="h-2 rounded-full bg-amber-500 transition-all" style={{ width: `${Math.round(upload.progress * 100)}%` }} />
              </div>
              <p className="num mt-1 text-xs text-walnut-600">Uploading… {Math.round(upload.progress * 100)} %</p>
            </div>
          )}
          {upload.isError && <div className="mt-3"><Alert tone="error" title="Not uploaded">{upload.error.message}</Alert></div>}
          <div className="mt-3 flex justify-end gap-2">
            <Button variant="secondary" onClick={clear} disabled={upload.isPending}>Clear</Button>
            <Button onClick={send} busy={upload.isPending}>
              <Upload className="h-4 w-4" aria-hidden /> Upload {pending.length === 1 ? 'photo' : `${pending.length} photos`}
            </Button>
          </div>
        </div>
      )}
      {photos.length === 0 ? (
        <p className="text-sm text-walnut-500">No condition photos yet.</p>
      ) : (
        <ul className="grid grid-cols-2 gap-4 sm:grid-cols-3 xl:grid-cols-4" aria-label="Condition photos">
          {photos.map((photo) => (
            <li key={photo.id} className="overflow-hidden rounded-lg border border-parchment-200 bg-white shadow-sm">
              <button type="button" className="group relative block w-full" onClick={() => setViewing(photo)} aria-label={`View ${photo.caption || 'photo'} large`}>
                <img src={photo.thumbUrl} alt={photo.caption || 'Condition photo'} className="aspect-[4/3] w-full object-cover" loading="lazy" />
                <span className="absolute right-1.5 top-1.5 rounded bg-walnut-900/70 p-1 text-parchment-50 opacity-0 group-hover:opacity-100">
                  <Maximize2 className="h-3.5 w-3.5" aria-hidden />
                </span>
              </button>
              <div className="px-2 py-1.5">
                {editing === photo.id ? (
                  <CaptionEditor photo={photo} pieceId={pieceId} onDone={() => setEditing(null)} />
                ) : (
                  <div className="flex items-start gap-1">
                    <p className={`min-w-0 flex-1 text-xs ${photo.caption ? 'text-walnut-800' : 'italic text-walnut-400'}`}>{photo.caption || 'No caption'}</p>
                    {canEdit && (
                      <>
                        <button type="button" className="rounded p-1 text-walnut-500 hover:bg-walnut-50" aria-label={`Edit caption of ${photo.caption || 'photo'}`} onClick={() => setEditing(photo.id)}>
                          <Pencil className="h-3.5 w-3.5" aria-hidden />
                        </button>
                        <button type="button" className="rounded p-1 text-brick-600 hover:bg-brick-100" aria-label={`Delete ${photo.caption || 'photo'}`} onClick={() => setDeleting(photo)}>
                          <Trash2 className="h-3.5 w-3.5" aria-hidden />
                        </button>
                      </>
                    )}
                  </div>
                )}
              </div>
            </li>
          ))}
        </ul>
      )}
      <Dialog title={viewing?.caption || 'Condition photo'} open={viewing !== null} onClose={() => setViewing(null)} wide>
        {viewing && (
          <figure>
            <img src={viewing.url} alt={viewing.caption || 'Condition photo'} className="max-h-[70vh] w-full rounded object-contain" />
            <figcaption className="num mt-2 text-xs text-walnut-500">
              {viewing.width} × {viewing.height} px · {fileSize(viewing.bytes)} · {new Date(viewing.createdAt).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' })}
            </figcaption>
          </figure>
        )}
      </Dialog>
      <Dialog title="Delete this photo?" open={deleting !== null} onClose={() => setDeleting(null)}>
        {deleting && (
          <div className="space-y-4">
            <div className="flex gap-3">
              <img src={deleting.thumbUrl} alt="" className="h-20 w-28 rounded object-cover" />
              <p className="text-sm text-walnut-700">“{deleting.caption || 'No caption'}” is removed from the piece for good.</p>
            </div>
            {remove.isError && <Alert tone="error" title="Not deleted">{remove.error.message}</Alert>}
            <div className="flex justify-end gap-2">
              <Button variant="secondary" onClick={() => setDeleting(null)}>Keep it</Button>
              <Button variant="danger" busy={remove.isPending} onClick={() => remove.mutate(deleting.id, { onSuccess: () => setDeleting(null) })}>
                <Trash2 className="h-4 w-4" aria-hidden /> Delete photo
              </Button>
            </div>
          </div>
        )}
      </Dialog>
    </div>
  );
}

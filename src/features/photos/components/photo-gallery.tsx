import { useQuery } from '@tanstack/react-query';
import { useEffect, useId, useRef, useState, type FormEvent } from 'react';
import { acceptedPhotoTypes, photoCaptionSchema, type Photo, type PhotoSubjectType } from '@shared/schemas/photos';
import { Button } from '@/components/ui/button';
import { EmptyState, Loading, Notice, Panel } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { ApiError } from '@/lib/api-client';
import { useDeletePhoto, useUpdatePhoto, useUploadPhoto } from '../api/photos.mutations';
import { photoListOptions } from '../api/photos.queries';

const dateFormat = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium' });

/** The caption, else who added the photo and when: never an empty alt for a photo that carries content. */
function altText(photo: Photo): string {
  return photo.caption || `Photo added by ${photo.ownerName} on ${dateFormat.format(new Date(photo.createdAt))}`;
}

/** The first caption problem, from the shared schema or from the server's field issues. */
function captionIssue(caption: string, error: unknown): string | undefined {
  const local = photoCaptionSchema.safeParse(caption);
  if (!local.success) return local.error.issues[0]?.message;
  return error instanceof ApiError ? error.fieldIssues.find((issue) => issue.path === 'caption')?.message : undefined;
}

function UploadForm({ subjectType, subjectId }: { subjectType: PhotoSubjectType; subjectId: number }) {
  const uploadPhoto = useUploadPhoto();
  const fileInput = useRef<HTMLInputElement>(null);
  const [file, setFile] = useState<File | null>(null);
  const [caption, setCaption] = useState('');
  const [progress, setProgress] = useState<number | null>(null);
  const [missingFile, setMissingFile] = useState(false);
  const [added, setAdded] = useState(false);

  const captionError = captionIssue(caption, uploadPhoto.error);
  const generalError = uploadPhoto.error && !(uploadPhoto.error instanceof ApiError && captionError) ? uploadPhoto.error : null;

  const submit = (event: FormEvent) => {
    event.preventDefault();
    setAdded(false);
    if (!file) {
      setMissingFile(true);
      return;
    }
    const parsed = photoCaptionSchema.safeParse(caption);
    if (!parsed.success) return;
    setProgress(0);
    uploadPhoto.mutate(
      { subjectType, subjectId, caption: parsed.data, file, onProgress: setProgress },
      {
        onSuccess: () => {
          setAdded(true);
          setFile(null);
          setCaption('');
          if (fileInput.current) fileInput.current.value = '';
        },
        onSettled: () => setProgress(null),
      },
    );
  };

  const percent = progress === null ? 0 : Math.round(progress * 100);
  return (
    <form onSubmit={submit} noValidate aria-label="Add a photo" className="mb-5 flex flex-col gap-3 rounded-chip bg-ptfe-100 p-4">
      {added ? <Notice tone="pass">Photo added.</Notice> : null}
      {generalError ? <Notice tone="fault">{generalError.message}</Notice> : null}
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField
          ref={fileInput}
          label="Image"
          type="file"
          accept={acceptedPhotoTypes.join(',')}
          hint="A JPEG, PNG or WebP photo. Location and camera data are removed."
          error={missingFile ? 'Choose an image to upload' : undefined}
          disabled={uploadPhoto.isPending}
          onChange={(event) => {
            setFile(event.target.files?.[0] ?? null);
            setMissingFile(false);
            uploadPhoto.reset();
          }}
        />
        <TextField
          label="Caption"
          value={caption}
          maxLength={500}
          placeholder="What the photo shows"
          error={captionError}
          disabled={uploadPhoto.isPending}
          onChange={(event) => setCaption(event.target.value)}
        />
      </div>
      {progress !== null ? (
        <div className="flex flex-col gap-1">
          <div
            role="progressbar"
            aria-label="Upload progress"
            aria-valuemin={0}
            aria-valuemax={100}
            aria-valuenow={percent}
            className="h-2 overflow-hidden rounded-full bg-ink-100"
          >
            <div className="h-full bg-copper-500 transition-[width]" style={{ width: `${percent}%` }} />
          </div>
          <p className="text-caption text-ink-500">{percent < 100 ? `Uploading… ${percent}%` : 'Processing the image…'}</p>
        </div>
      ) : null}
      <div>
        <Button type="submit" disabled={uploadPhoto.isPending}>
          {uploadPhoto.isPending ? 'Uploading…' : 'Add photo'}
        </Button>
      </div>
    </form>
  );
}

function CaptionForm({ photo }: { photo: Photo }) {
  const update = useUpdatePhoto();
  const [caption, setCaption] = useState(photo.caption);
  const [saved, setSaved] = useState(false);
  const error = captionIssue(caption, update.error);
  const generalError = update.error && !error ? update.error : null;

  const submit = (event: FormEvent) => {
    event.preventDefault();
    setSaved(false);
    const parsed = photoCaptionSchema.safeParse(caption);
    if (!parsed.success) return;
    update.mutate({ id: photo.id, changes: { caption: parsed.data } }, { onSuccess: () => setSaved(true) });
  };

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-2">
      {generalError ? <Notice tone="fault">{generalError.message}</Notice> : null}
      <TextField
        label="Caption"
        value={caption}
        maxLength={500}
        error={error}
        onChange={(event) => {
          setCaption(event.target.value);
          setSaved(false);
        }}
      />
      <div className="flex items-center gap-3">
        <Button type="submit" variant="secondary" disabled={update.isPending || caption.trim() === photo.caption}>
          {update.isPending ? 'Saving…' : 'Save caption'}
        </Button>
        {saved ? (
          <span role="status" className="text-caption text-pass-700">
            Caption saved.
          </span>
        ) : null}
      </div>
    </form>
  );
}

function DeletePhoto({ photo, onDeleted }: { photo: Photo; onDeleted: () => void }) {
  const remove = useDeletePhoto();
  const [confirming, setConfirming] = useState(false);
  return (
    <div className="flex flex-col gap-2">
      {remove.error ? <Notice tone="fault">{remove.error.message}</Notice> : null}
      {confirming ? (
        <div role="group" aria-label="Confirm deletion" className="flex flex-wrap items-center gap-2">
          <span className="text-body text-ink-700">Delete this photo for everyone? This cannot be undone.</span>
          <Button variant="danger" disabled={remove.isPending} onClick={() => remove.mutate(photo.id, { onSuccess: onDeleted })}>
            {remove.isPending ? 'Deleting…' : 'Delete photo'}
          </Button>
          <Button variant="quiet" disabled={remove.isPending} onClick={() => setConfirming(false)}>
            Keep
          </Button>
        </div>
      ) : (
        <div>
          <Button variant="secondary" onClick={() => setConfirming(true)}>
            Delete…
          </Button>
        </div>
      )}
    </div>
  );
}

/**
 * The larger view, in a native modal <dialog>: it keeps focus inside, closes on Escape and returns focus to
 * the thumbnail that opened it.
 */
function PhotoDialog({ photo, mayChange, onClose }: { photo: Photo; mayChange: boolean; onClose: () => void }) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();
  useEffect(() => {
    const dialog = ref.current;
    dialog?.showModal();
    return () => {
      if (dialog?.open) dialog.close();
    };
  }, []);
  const close = () => ref.current?.close();

  return (
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      onClose={onClose}
      // A click on the backdrop lands on the <dialog> itself (its content covers the rest): close, like Escape.
      onClick={(event) => {
        if (event.target === event.currentTarget) close();
      }}
      className="m-auto max-h-[94vh] w-[min(64rem,94vw)] overflow-auto rounded-panel bg-white p-0 shadow-lifted backdrop:bg-ink-900/70"
    >
      <div className="flex items-start justify-between gap-4 border-b border-ink-100 px-5 py-3">
        <h2 id={titleId} className="text-lead font-bold text-ink-800">
          {photo.caption || 'Photo'}
        </h2>
        <Button variant="quiet" onClick={close}>
          Close
        </Button>
      </div>
      <div className="bg-ink-50">
        <img
          src={photo.displayUrl}
          alt={altText(photo)}
          width={photo.width}
          height={photo.height}
          className="mx-auto block h-auto max-h-[58vh] w-auto max-w-full object-contain"
        />
      </div>
      <div className="flex flex-col gap-4 px-5 py-4">
        <p className="text-caption text-ink-500">
          Added by {photo.ownerName} on {dateFormat.format(new Date(photo.createdAt))} · {photo.width} × {photo.height} px
        </p>
        {mayChange ? (
          <>
            <CaptionForm key={photo.id} photo={photo} />
            <DeletePhoto photo={photo} onDeleted={close} />
          </>
        ) : null}
      </div>
    </dialog>
  );
}

export interface PhotoGalleryProps {
  subjectType: PhotoSubjectType;
  subjectId: number;
  /** Whether the signed-in person may add photos to this subject (see photoUploadRoles). */
  canUpload: boolean;
  currentUserId: number;
  isManager: boolean;
}

/** Photos of one instrument, part or setup: thumbnails, a larger view, upload, caption and delete. */
export function PhotoGallery({ subjectType, subjectId, canUpload, currentUserId, isManager }: PhotoGalleryProps) {
  const photos = useQuery(photoListOptions(subjectType, subjectId));
  const [openId, setOpenId] = useState<number | null>(null);
  const open = photos.data?.find((photo) => photo.id === openId) ?? null;

  let body;
  if (photos.isPending) body = <Loading label="Loading photos…" />;
  else if (photos.isError) body = <Notice tone="fault">{photos.error.message}</Notice>;
  else if (!photos.data.length) {
    body = <EmptyState title="No photos yet">{canUpload ? 'Add the first one with the form above.' : null}</EmptyState>;
  } else {
    body = (
      <ul className="grid grid-cols-2 gap-3 sm:grid-cols-3 lg:grid-cols-4">
        {photos.data.map((photo) => (
          <li key={photo.id} className="flex flex-col gap-1">
            <button
              type="button"
              onClick={() => setOpenId(photo.id)}
              className="block overflow-hidden rounded-chip bg-ptfe-100 ring-1 ring-ink-100 transition hover:ring-copper-300"
            >
              <img src={photo.thumbUrl} alt={altText(photo)} loading="lazy" className="aspect-square w-full object-cover" />
            </button>
            {photo.caption ? (
              // The button is already named by the alt text; this line is for sighted readers.
              <p aria-hidden className="truncate text-caption text-ink-600">
                {photo.caption}
              </p>
            ) : null}
          </li>
        ))}
      </ul>
    );
  }

  return (
    <Panel title="Photos">
      {canUpload ? <UploadForm subjectType={subjectType} subjectId={subjectId} /> : null}
      {body}
      {open ? (
        <PhotoDialog
          key={open.id}
          photo={open}
          mayChange={isManager || open.ownerId === currentUserId}
          onClose={() => setOpenId(null)}
        />
      ) : null}
    </Panel>
  );
}

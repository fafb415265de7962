"use client";

import { useRef, useState } from "react";
import { buttonClass } from "@/components/ui/button";
import { queuePhoto } from "@/lib/client/offline-save";
import { cn } from "@/lib/utils";
import { MAX_PHOTO_BYTES, type Photo } from "./types";

type Status = { state: "on-device" } | { state: "queued" } | { state: "uploading"; percent: number } | { state: "processing" } | { state: "done"; notices: string[] } | { state: "error"; message: string };
interface Item {
  key: string;
  file: File;
  status: Status;
}

class NetworkDrop extends Error {}

/** The project and the sample or station of an upload URL (/api/projects/:p/samples|stations/:id/photos). */
function ownerOfUrl(url: string): { projectId: string; owner: { kind: "sample" | "station"; id: string } } | null {
  const m = /\/api\/projects\/([^/]+)\/(samples|stations)\/([^/]+)\/photos$/.exec(url);
  return m ? { projectId: m[1], owner: { kind: m[2] === "samples" ? "sample" : "station", id: m[3] } } : null;
}

/** Sends one file with upload progress (fetch cannot report upload progress; XMLHttpRequest can). */
function sendOne(url: string, file: File, onProgress: (p: number) => void, onSent: () => void): Promise<{ items: Photo[]; notices: { file: string; messages: string[] }[] }> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open("POST", url);
    xhr.responseType = "json";
    xhr.upload.onprogress = (e) => e.lengthComputable && onProgress(Math.round((e.loaded / e.total) * 100));
    xhr.upload.onload = onSent;
    xhr.onload = () => {
      if (xhr.status >= 200 && xhr.status < 300) resolve(xhr.response);
      else reject(new Error(xhr.response?.error?.message ?? `Upload failed (${xhr.status}).`));
    };
    xhr.onerror = () => reject(new NetworkDrop("Network error — the photo was not uploaded. Check the connection and try again."));
    const fd = new FormData();
    fd.append("files", file, file.name);
    xhr.send(fd);
  });
}

/**
 * Drag-and-drop (or pick) several photos; each uploads on its own with a progress bar, two at a time,
 * so one bad file does not stop the others.
 */
export function PhotoUploader({ uploadUrl, onUploaded }: { uploadUrl: string; onUploaded: () => void }) {
  const [items, setItems] = useState<Item[]>([]);
  const [over, setOver] = useState(false);
  const input = useRef<HTMLInputElement>(null);
  const update = (key: string, status: Status) => setItems((xs) => xs.map((x) => (x.key === key ? { ...x, status } : x)));

  async function addFiles(list: FileList | File[]) {
    const files = [...list];
    if (!files.length) return;
    const added: Item[] = files.map((file) => ({
      key: `${file.name}-${file.size}-${file.lastModified}-${Math.random()}`,
      file,
      status:
        file.size > MAX_PHOTO_BYTES
          ? { state: "error", message: `${file.name} is ${(file.size / 1024 / 1024).toFixed(1)} MB; photos may be at most 25 MB.` }
          : { state: "queued" },
    }));
    setItems((xs) => [...added, ...xs]);
    const queue = added.filter((i) => i.status.state === "queued");
    const worker = async () => {
      for (let item = queue.shift(); item; item = queue.shift()) {
        const key = item.key;
        update(key, { state: "uploading", percent: 0 });
        try {
          const res = await sendOne(uploadUrl, item.file, (percent) => update(key, { state: "uploading", percent }), () => update(key, { state: "processing" }));
          update(key, { state: "done", notices: res.notices.flatMap((n) => n.messages) });
          onUploaded();
        } catch (e) {
          const o = e instanceof NetworkDrop ? ownerOfUrl(uploadUrl) : null;
          if (o) {
            // No connection: the photo waits on this device and is sent resumably by the sync (see the sync page).
            await queuePhoto({ ...o, label: `Photo of ${o.owner.kind} (${item.file.name})`, file: item.file });
            update(key, { state: "on-device" });
          } else update(key, { state: "error", message: (e as Error).message });
        }
      }
    };
    await Promise.all([worker(), worker()]);
  }

  return (
    <div className="space-y-2">
      <div
        onDragOver={(e) => {
          e.preventDefault();
          setOver(true);
        }}
        onDragLeave={() => setOver(false)}
        onDrop={(e) => {
          e.preventDefault();
          setOver(false);
          void addFiles(e.dataTransfer.files);
        }}
        className={cn("flex flex-col items-center gap-2 rounded-lg border-2 border-dashed p-5 text-center text-sm", over ? "border-brand bg-brand-light" : "border-line bg-white")}
        data-testid="photo-dropzone"
      >
        <p>Drop photos here, or</p>
        <label className={buttonClass("secondary", "cursor-pointer")}>
          Choose photos…
          <input
            ref={input}
            type="file"
            accept="image/jpeg,image/png,image/webp,image/tiff,image/avif,.jpg,.jpeg,.png,.webp,.tif,.tiff,.avif"
            multiple
            className="sr-only"
            onChange={(e) => {
              if (e.target.files) void addFiles(e.target.files);
              e.target.value = "";
            }}
          />
        </label>
        <p className="text-xs text-muted">JPEG, PNG, WebP, TIFF or AVIF, up to 25 MB each. Include a scale (hammer, card) and the sample tag in the picture.</p>
      </div>
      {items.length > 0 && (
        <ul className="space-y-1 text-sm" aria-label="Uploads" aria-live="polite">
          {items.map(({ key, file, status }) => (
            <li key={key} className="rounded border border-line bg-white px-3 py-2">
              <div className="flex items-center justify-between gap-2">
                <span className="truncate">{file.name}</span>
                <span className={cn("shrink-0 text-xs", status.state === "error" ? "text-danger" : status.state === "done" ? "text-ok" : "text-muted")}>
                  {status.state === "queued" && "Waiting…"}
                  {status.state === "uploading" && `Uploading ${status.percent} %`}
                  {status.state === "processing" && "Processing…"}
                  {status.state === "done" && "Uploaded"}
                  {status.state === "error" && "Not uploaded"}
                  {status.state === "on-device" && "Saved on this device — sent when online"}
                </span>
              </div>
              {status.state === "uploading" && (
                <progress className="mt-1 h-1.5 w-full accent-brand" max={100} value={status.percent} aria-label={`Upload progress of ${file.name}`} />
              )}
              {status.state === "error" && (
                <p className="mt-1 text-xs text-danger" role="alert">
                  {status.message}
                </p>
              )}
              {status.state === "done" &&
                status.notices.map((n) => (
                  <p key={n} className="mt-1 text-xs text-oxide">
                    {n}
                  </p>
                ))}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

"use client";

import { PhotoGallery, type GallerySample } from "./photo-gallery";

/** The photo card of a sample page: upload (for writers) and gallery with "use this position". */
export function SamplePhotos({ projectId, sample, canWrite }: { projectId: string; sample: GallerySample; canWrite: boolean }) {
  return (
    <section className="rounded-lg border border-line bg-white p-4 shadow-sm" aria-labelledby="sample-photos-h" id="photos">
      <h2 id="sample-photos-h" className="mb-3 font-semibold">
        Photos
      </h2>
      <PhotoGallery projectId={projectId} owner={{ sampleId: sample.id }} canWrite={canWrite} sample={sample} />
    </section>
  );
}

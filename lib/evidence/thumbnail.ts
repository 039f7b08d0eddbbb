import sharp from 'sharp';

export const THUMBNAIL_EDGE_PX = 320;

export type Thumbnail = { bytes: Buffer; contentType: 'image/webp'; width: number; height: number };

/**
 * A small preview for the gallery: turned upright by the camera's orientation tag, fitted inside
 * 320 × 320 px, re-encoded as WebP. Re-encoding also drops the original's metadata (location, camera
 * serial), so the preview other parties see first carries none of it; the original stays untouched.
 */
export async function makeThumbnail(bytes: Uint8Array): Promise<Thumbnail> {
  const { data, info } = await sharp(bytes, { failOn: 'error', limitInputPixels: 50_000_000 })
    .rotate()
    .resize(THUMBNAIL_EDGE_PX, THUMBNAIL_EDGE_PX, { fit: 'inside', withoutEnlargement: true })
    .webp({ quality: 72 })
    .toBuffer({ resolveWithObject: true });
  return { bytes: data, contentType: 'image/webp', width: info.width, height: info.height };
}

/** The thumbnail's own name in storage, derived from the original's so the two are easy to pair. */
export function thumbnailName(fileName: string): string {
  const dot = fileName.lastIndexOf('.');
  return `${dot > 0 ? fileName.slice(0, dot) : fileName}.thumbnail.webp`;
}

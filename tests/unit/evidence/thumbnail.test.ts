import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { makeThumbnail, thumbnailName, THUMBNAIL_EDGE_PX } from '@/lib/evidence/thumbnail';
import { sampleImage } from './samples';

describe('photo previews', () => {
  it('fits a photo inside 320 px as WebP and keeps its proportions', async () => {
    const photo = await sampleImage('jpeg', 1600, 1200);
    const preview = await makeThumbnail(photo);
    const meta = await sharp(preview.bytes).metadata();
    expect(meta.format).toBe('webp');
    expect([meta.width, meta.height]).toEqual([THUMBNAIL_EDGE_PX, 240]);
    expect(preview.bytes.length).toBeLessThan(photo.length);
  });

  it('turns a photo upright by its orientation tag and carries none of its metadata', async () => {
    // Orientation 6: the camera was turned a quarter; the stored pixels are landscape.
    const sideways = await sharp(await sampleImage('jpeg', 400, 200)).withMetadata({ orientation: 6 }).jpeg().toBuffer();
    const preview = await makeThumbnail(sideways);
    const meta = await sharp(preview.bytes).metadata();
    expect([meta.width, meta.height]).toEqual([160, 320]);
    expect(meta.exif).toBeUndefined();
    expect(meta.orientation).toBeUndefined();
  });

  it('never enlarges a small image', async () => {
    const small = await sampleImage('png', 120, 80);
    const meta = await sharp((await makeThumbnail(small)).bytes).metadata();
    expect([meta.width, meta.height]).toEqual([120, 80]);
  });

  it('names the preview after its original', () => {
    expect(thumbnailName('seal 7.jpg')).toBe('seal 7.thumbnail.webp');
  });
});

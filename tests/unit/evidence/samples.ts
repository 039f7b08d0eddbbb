import sharp from 'sharp';

/** A one-page PDF with a correct cross-reference table, built here so every byte is known. */
export function minimalPdf(extra = ''): Buffer {
  const content = 'BT /F1 12 Tf 20 100 Td (Lab sheet) Tj ET';
  const objects = [
    '<< /Type /Catalog /Pages 2 0 R >>',
    '<< /Type /Pages /Kids [3 0 R] /Count 1 >>',
    '<< /Type /Page /Parent 2 0 R /MediaBox [0 0 200 200] /Contents 4 0 R >>',
    `<< /Length ${content.length} >>\nstream\n${content}\nendstream`,
  ];
  let body = `%PDF-1.4\n${extra}`;
  const offsets: number[] = [];
  objects.forEach((object, i) => {
    offsets.push(Buffer.byteLength(body, 'latin1'));
    body += `${i + 1} 0 obj\n${object}\nendobj\n`;
  });
  const xrefAt = Buffer.byteLength(body, 'latin1');
  body += `xref\n0 ${objects.length + 1}\n0000000000 65535 f \n`;
  for (const offset of offsets) body += `${String(offset).padStart(10, '0')} 00000 n \n`;
  body += `trailer\n<< /Size ${objects.length + 1} /Root 1 0 R >>\nstartxref\n${xrefAt}\n%%EOF\n`;
  return Buffer.from(body, 'latin1');
}

/** A real photo-like image: a gradient, so the encoders have something to compress. */
export async function sampleImage(format: 'png' | 'jpeg' | 'webp', width = 640, height = 480): Promise<Buffer> {
  const pixels = Buffer.alloc(width * height * 3);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const i = (y * width + x) * 3;
      pixels[i] = (x * 255) / width;
      pixels[i + 1] = (y * 255) / height;
      pixels[i + 2] = ((x + y) * 127) / (width + height);
    }
  }
  return sharp(pixels, { raw: { width, height, channels: 3 } }).toFormat(format).toBuffer();
}

export const goodCsv = Buffer.from('sample,reading_1_c,reading_2_c\nR-0412,-0.5123,-0.5118\nR-0413,-0.5131,-0.5127\n', 'utf8');

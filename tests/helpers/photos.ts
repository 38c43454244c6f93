import sharp from 'sharp';

/**
 * A real JPEG as a phone writes it: EXIF with camera make, orientation 6 (rotate 90° on show)
 * and GPS position tags (IFD3 is libvips' name for the GPS directory).
 */
export async function phoneJpegWithGps(width = 400, height = 300): Promise<Buffer> {
	return sharp({ create: { width, height, channels: 3, background: { r: 180, g: 90, b: 50 } } })
		.jpeg()
		.withExif({
			IFD0: { Make: 'InventedPhone', Model: 'Rig Cam 1' },
			IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '51/1 30/1 0/1', GPSLongitudeRef: 'W', GPSLongitude: '0/1 7/1 0/1' }
		})
		.withMetadata({ orientation: 6 })
		.toBuffer();
}

/** Whether an EXIF block holds a GPS directory pointer (tag 0x8825, TIFF 6.0 / EXIF 2.3), either byte order. */
export function hasGpsPointer(exif: Buffer | undefined): boolean {
	return !!exif && (exif.includes(Buffer.from([0x25, 0x88])) || exif.includes(Buffer.from([0x88, 0x25])));
}

export async function plainPng(width = 64, height = 48): Promise<Buffer> {
	return sharp({ create: { width, height, channels: 3, background: { r: 20, g: 120, b: 140 } } }).png().toBuffer();
}

/** The smallest PDF most readers accept (one empty page). */
export const tinyPdf = Buffer.from(
	'%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj\n2 0 obj<</Type/Pages/Kids[3 0 R]/Count 1>>endobj\n3 0 obj<</Type/Page/Parent 2 0 R/MediaBox[0 0 200 200]>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n'
);

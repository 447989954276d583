import { PDFDocument, StandardFonts } from "pdf-lib";

/**
 * Files built by code for the upload checks. Layouts follow the published formats: EBML header with DocType "webm"
 * (Matroska/WebM spec, IETF RFC 8794 §11 EBML header elements), ISO base media `ftyp` box (ISO/IEC 14496-12 §4.3),
 * PNG signature and IHDR chunk (W3C PNG spec §5.2, §11.2.2); PDFs are written with pdf-lib from the registry.
 */
function ebmlElement(id: number[], payload: number[]): number[] {
  // Sizes here are below 127, so the one-byte EBML variable-size integer 1xxxxxxx is enough (RFC 8794 §4).
  return [...id, 0x80 | payload.length, ...payload];
}

export function webmBytes(extra = 4096): Uint8Array {
  const ascii = (s: string) => [...s].map((c) => c.charCodeAt(0));
  const header = [
    ...ebmlElement([0x42, 0x86], [1]), // EBMLVersion
    ...ebmlElement([0x42, 0xf7], [1]), // EBMLReadVersion
    ...ebmlElement([0x42, 0xf2], [4]), // EBMLMaxIDLength
    ...ebmlElement([0x42, 0xf3], [8]), // EBMLMaxSizeLength
    ...ebmlElement([0x42, 0x82], ascii("webm")), // DocType
    ...ebmlElement([0x42, 0x87], [4]), // DocTypeVersion
    ...ebmlElement([0x42, 0x85], [2]), // DocTypeReadVersion
  ];
  const out = new Uint8Array(5 + header.length + extra);
  out.set([0x1a, 0x45, 0xdf, 0xa3, 0x80 | header.length, ...header]);
  for (let i = 5 + header.length; i < out.length; i++) out[i] = (i * 31) & 0xff;
  return out;
}

export function mp4Bytes(extra = 4096): Uint8Array {
  const box = Buffer.alloc(24 + extra);
  box.writeUInt32BE(24, 0);
  box.write("ftyp", 4, "latin1");
  box.write("isom", 8, "latin1"); // major brand
  box.writeUInt32BE(0x200, 12); // minor version
  box.write("isomavc1", 16, "latin1"); // compatible brands
  return new Uint8Array(box);
}

export function pngBytes(): Uint8Array {
  const b = Buffer.alloc(8 + 25);
  b.set([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
  b.writeUInt32BE(13, 8);
  b.write("IHDR", 12, "latin1");
  b.writeUInt32BE(4, 16);
  b.writeUInt32BE(4, 20);
  b.set([8, 6, 0, 0, 0], 24);
  return new Uint8Array(b);
}

export async function pdfBytes(text = "Referral letter (fictional, for tests)"): Promise<Uint8Array> {
  const doc = await PDFDocument.create();
  const page = doc.addPage([595, 842]);
  page.drawText(text, { x: 50, y: 780, size: 14, font: await doc.embedFont(StandardFonts.Helvetica) });
  return doc.save();
}

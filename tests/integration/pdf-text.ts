import { inflateSync } from "node:zlib";
import { PDFDocument } from "pdf-lib";

/** Text drawn with pdf-lib's standard fonts, from the page content streams (Flate-compressed hex strings). */
export async function pdfText(bytes: Uint8Array): Promise<string> {
  const doc = await PDFDocument.load(bytes);
  let text = "";
  for (const page of doc.getPages()) {
    const contents = page.node.Contents();
    const streams = contents && "asArray" in contents ? contents.asArray() : [contents];
    for (const ref of streams) {
      const stream = doc.context.lookup(ref as never) as unknown as { getContents(): Uint8Array };
      const raw = Buffer.from(stream.getContents());
      let body: string;
      try {
        body = inflateSync(raw).toString("latin1");
      } catch {
        body = raw.toString("latin1");
      }
      for (const m of body.matchAll(/<([0-9A-Fa-f]+)>\s*Tj/g)) text += `${Buffer.from(m[1], "hex").toString("latin1")}\n`;
    }
  }
  return text;
}
